import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from 'sequelize';
import type { MaterialParams } from '@phaseloop/shared';

export type MaterialVersionStatus = 'draft' | 'approved' | 'rejected';

export class Material extends Model<InferAttributes<Material>, InferCreationAttributes<Material>> {
  declare id: CreationOptional<string>;
  declare projectId: string;
  declare name: string;
  declare isDemo: CreationOptional<boolean>;
  declare description: CreationOptional<string>;
  declare createdBy: string | null;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
}

export class MaterialVersion extends Model<InferAttributes<MaterialVersion>, InferCreationAttributes<MaterialVersion>> {
  declare id: CreationOptional<string>;
  declare materialId: string;
  declare version: number;
  declare status: CreationOptional<MaterialVersionStatus>;
  declare params: MaterialParams;
  /** Where the values came from: test data ids, calibration settings and errors, or "entered by hand". */
  declare provenance: CreationOptional<Record<string, unknown>>;
  declare notes: CreationOptional<string>;
  declare createdBy: string | null;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
  declare reviewedBy: CreationOptional<string | null>;
  declare reviewedAt: CreationOptional<Date | null>;
  declare reviewReason: CreationOptional<string>;
}

export function initMaterialModels(sequelize: Sequelize): void {
  Material.init(
    {
      id: { type: DataTypes.UUID, primaryKey: true, defaultValue: DataTypes.UUIDV4 },
      projectId: { type: DataTypes.UUID, allowNull: false },
      name: { type: DataTypes.TEXT, allowNull: false },
      isDemo: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: false },
      description: { type: DataTypes.TEXT, allowNull: false, defaultValue: '' },
      createdBy: { type: DataTypes.UUID, allowNull: true },
      createdAt: DataTypes.DATE,
      updatedAt: DataTypes.DATE,
    },
    { sequelize, tableName: 'materials' },
  );
  MaterialVersion.init(
    {
      id: { type: DataTypes.UUID, primaryKey: true, defaultValue: DataTypes.UUIDV4 },
      materialId: { type: DataTypes.UUID, allowNull: false },
      version: { type: DataTypes.INTEGER, allowNull: false },
      status: { type: DataTypes.TEXT, allowNull: false, defaultValue: 'draft' },
      params: { type: DataTypes.JSONB, allowNull: false },
      provenance: { type: DataTypes.JSONB, allowNull: false, defaultValue: {} },
      notes: { type: DataTypes.TEXT, allowNull: false, defaultValue: '' },
      createdBy: { type: DataTypes.UUID, allowNull: true },
      createdAt: DataTypes.DATE,
      updatedAt: DataTypes.DATE,
      reviewedBy: { type: DataTypes.UUID, allowNull: true },
      reviewedAt: { type: DataTypes.DATE, allowNull: true },
      reviewReason: { type: DataTypes.TEXT, allowNull: false, defaultValue: '' },
    },
    { sequelize, tableName: 'material_versions' },
  );
}
