import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from 'sequelize';
import type { StudyDefinition } from './study-definition';

export class Study extends Model<InferAttributes<Study>, InferCreationAttributes<Study>> {
  declare id: CreationOptional<string>;
  declare projectId: string;
  declare name: string;
  declare isDemo: CreationOptional<boolean>;
  declare description: CreationOptional<string>;
  declare definition: StudyDefinition;
  /** Raised on every save, so a run can say which revision it froze. */
  declare revision: CreationOptional<number>;
  declare createdBy: string | null;
  declare deletedAt: CreationOptional<Date | null>;
  declare deletedBy: CreationOptional<string | null>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
}

export function initStudyModels(sequelize: Sequelize): void {
  Study.init(
    {
      id: { type: DataTypes.UUID, primaryKey: true, defaultValue: DataTypes.UUIDV4 },
      projectId: { type: DataTypes.UUID, allowNull: false },
      name: { type: DataTypes.TEXT, allowNull: false },
      isDemo: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: false },
      description: { type: DataTypes.TEXT, allowNull: false, defaultValue: '' },
      definition: { type: DataTypes.JSONB, allowNull: false },
      revision: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 1 },
      createdBy: { type: DataTypes.UUID, allowNull: true },
      deletedAt: { type: DataTypes.DATE, allowNull: true },
      deletedBy: { type: DataTypes.UUID, allowNull: true },
      createdAt: DataTypes.DATE,
      updatedAt: DataTypes.DATE,
    },
    { sequelize, tableName: 'studies' },
  );
}
