import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from 'sequelize';
import type { MeshGroup, MeshPartData } from '@phaseloop/shared';

/** What the upload summary shows besides the counts (kept together: it is only ever read whole). */
export interface StoredMeshSummary {
  elementTypes: Record<string, number>;
  bounds: { minX: number; maxX: number; minY: number; maxY: number };
  groups: MeshGroup[];
  warnings: string[];
}

export class Mesh extends Model<InferAttributes<Mesh>, InferCreationAttributes<Mesh>> {
  declare id: CreationOptional<string>;
  declare projectId: string;
  declare name: string;
  declare fileName: string;
  declare format: '2.2' | '4.1';
  declare size: number;
  declare nodeCount: number;
  declare elementCount: number;
  declare summary: StoredMeshSummary;
  declare mesh: MeshPartData;
  /** The file as uploaded. */
  declare content: string;
  declare uploadedBy: string | null;
  declare createdAt: CreationOptional<Date>;
  declare deletedAt: CreationOptional<Date | null>;
}

export function initMeshModels(sequelize: Sequelize): void {
  Mesh.init(
    {
      id: { type: DataTypes.UUID, primaryKey: true, defaultValue: DataTypes.UUIDV4 },
      projectId: { type: DataTypes.UUID, allowNull: false },
      name: { type: DataTypes.TEXT, allowNull: false },
      fileName: { type: DataTypes.TEXT, allowNull: false },
      format: { type: DataTypes.TEXT, allowNull: false },
      size: { type: DataTypes.INTEGER, allowNull: false },
      nodeCount: { type: DataTypes.INTEGER, allowNull: false },
      elementCount: { type: DataTypes.INTEGER, allowNull: false },
      summary: { type: DataTypes.JSONB, allowNull: false },
      mesh: { type: DataTypes.JSONB, allowNull: false },
      content: { type: DataTypes.TEXT, allowNull: false },
      uploadedBy: { type: DataTypes.UUID, allowNull: true },
      createdAt: DataTypes.DATE,
      deletedAt: { type: DataTypes.DATE, allowNull: true },
    },
    { sequelize, tableName: 'meshes', updatedAt: false },
  );
}
