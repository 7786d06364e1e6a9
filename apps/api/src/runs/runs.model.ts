import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from 'sequelize';
import type { MaterialParams, RunReviewStatus, RunState } from '@phaseloop/shared';
import type { StudyDefinition } from '../studies/study-definition';

/** Everything a run needs, frozen at submission: later edits of the study or materials never change it. */
export interface RunSnapshot {
  study: { id: string; name: string; revision: number; definition: StudyDefinition };
  materials: { versionId: string; materialId: string; name: string; version: number; status: string; params: MaterialParams }[];
  solverVersion: string;
  /** Solver name, version and the git commit of the code that queued it. */
  solver?: { name: string; version: string; commit: string };
  submittedAt: string;
}

export type { RunReviewStatus } from '@phaseloop/shared';

export class Run extends Model<InferAttributes<Run>, InferCreationAttributes<Run>> {
  declare id: CreationOptional<string>;
  declare projectId: string;
  declare studyId: string;
  declare sweepId: string | null;
  declare number: number;
  declare state: RunState;
  declare snapshot: RunSnapshot;
  declare solverVersion: string;
  declare jobId: CreationOptional<string | null>;
  declare message: CreationOptional<string>;
  declare progress: CreationOptional<Record<string, unknown>>;
  declare workerId: CreationOptional<string | null>;
  declare submittedBy: string | null;
  declare createdAt: CreationOptional<Date>;
  declare queuedAt: Date | null;
  declare startedAt: CreationOptional<Date | null>;
  declare finishedAt: CreationOptional<Date | null>;
  declare cancelRequestedAt: CreationOptional<Date | null>;
  declare cancelledBy: CreationOptional<string | null>;
  declare attempts: CreationOptional<number>;
  declare priority: CreationOptional<number>;
  declare reviewStatus: CreationOptional<RunReviewStatus>;
  declare reviewedBy: CreationOptional<string | null>;
  declare reviewedAt: CreationOptional<Date | null>;
  declare reviewReason: CreationOptional<string>;
}

export function initRunModels(sequelize: Sequelize): void {
  Run.init(
    {
      id: { type: DataTypes.UUID, primaryKey: true, defaultValue: DataTypes.UUIDV4 },
      projectId: { type: DataTypes.UUID, allowNull: false },
      studyId: { type: DataTypes.UUID, allowNull: false },
      sweepId: { type: DataTypes.UUID, allowNull: true },
      number: { type: DataTypes.INTEGER, allowNull: false },
      state: { type: DataTypes.TEXT, allowNull: false },
      snapshot: { type: DataTypes.JSONB, allowNull: false },
      solverVersion: { type: DataTypes.TEXT, allowNull: false },
      jobId: { type: DataTypes.TEXT, allowNull: true },
      message: { type: DataTypes.TEXT, allowNull: false, defaultValue: '' },
      progress: { type: DataTypes.JSONB, allowNull: false, defaultValue: {} },
      workerId: { type: DataTypes.TEXT, allowNull: true },
      submittedBy: { type: DataTypes.UUID, allowNull: true },
      createdAt: DataTypes.DATE,
      queuedAt: { type: DataTypes.DATE, allowNull: true },
      startedAt: { type: DataTypes.DATE, allowNull: true },
      finishedAt: { type: DataTypes.DATE, allowNull: true },
      cancelRequestedAt: { type: DataTypes.DATE, allowNull: true },
      cancelledBy: { type: DataTypes.UUID, allowNull: true },
      attempts: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
      priority: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
      reviewStatus: { type: DataTypes.TEXT, allowNull: false, defaultValue: 'none' },
      reviewedBy: { type: DataTypes.UUID, allowNull: true },
      reviewedAt: { type: DataTypes.DATE, allowNull: true },
      reviewReason: { type: DataTypes.TEXT, allowNull: false, defaultValue: '' },
    },
    { sequelize, tableName: 'runs', updatedAt: false },
  );
}
