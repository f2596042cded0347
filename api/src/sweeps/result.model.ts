/**
 * The `results` and `executions` tables (migration 0200-sweeps), for readers such as the
 * leaderboards. Sweeps write them with plain SQL (INSERT … ON CONFLICT DO NOTHING, see
 * workers/record-run-result.ts); these models are for reading.
 */
import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from 'sequelize';
import type { RobotProfile } from '@shared/plan';
import type { RunOutcome } from '@shared/runs';

/** One solve's outcome with its typed figures and provenance. */
export class Result extends Model<InferAttributes<Result>, InferCreationAttributes<Result>> {
  declare id: CreationOptional<number>;
  declare runId: number | null;
  declare sweepId: number | null;
  declare submissionId: number | null;
  declare instanceSetId: number;
  declare mapId: number;
  declare scenarioId: number;
  declare agents: number;
  declare model: string;
  declare params: Record<string, unknown>;
  declare paramHash: string;
  declare seed: number;
  declare status: RunOutcome;
  declare reason: string | null;
  declare soc: number | null;
  declare makespan: number | null;
  declare turnInclusiveSocMs: number | null;
  declare turnInclusiveMakespanMs: number | null;
  declare lowerBound: number | null;
  declare runtimeMs: number | null;
  declare nodes: number | null;
  declare nodesExpanded: number | null;
  declare turns: number | null;
  declare robotProfile: RobotProfile;
  declare robotProfileHash: string;
  declare solverVersion: string;
  declare solverCommit: string;
  declare nodeVersion: string;
  declare cpuModel: string;
  declare threadCount: number;
  /** gzip of the plan JSON ({ kind: 'paths' | 'schedule', … }). */
  declare planGz: Buffer | null;
  /** Collision-free when replayed open-loop with zero noise under its own profile; null = not checked (migration 0405). */
  declare isExecutableAtNominal: boolean | null;
  /** Collisions of that replay; null = not checked. */
  declare nominalCollisions: number | null;
  declare createdAt: CreationOptional<Date>;
}

/** One policy's Monte Carlo replay of a result. */
export class Execution extends Model<InferAttributes<Execution>, InferCreationAttributes<Execution>> {
  declare id: CreationOptional<number>;
  declare resultId: number;
  declare policy: string;
  declare noise: Record<string, number>;
  declare runs: number;
  declare successRate: number;
  declare collisionsMean: number;
  declare realisedMakespanMeanMs: number | null;
  declare realisedMakespanP95Ms: number | null;
  declare finishSpreadMeanMs: number | null;
  declare metrics: Record<string, unknown>;
  declare createdAt: CreationOptional<Date>;
}

/** The Result class bound to one Sequelize instance. */
export type ResultModel = typeof Result;
/** The Execution class bound to one Sequelize instance. */
export type ExecutionModel = typeof Execution;

/**
 * A nullable double column. A function, not a shared object: Sequelize writes each attribute's
 * column name into its definition object, so attributes sharing one object all read one column.
 */
const num = () => ({ type: DataTypes.DOUBLE, allowNull: true });

/** Binds fresh subclasses of Result and Execution to `sequelize`. */
export function defineResultModels(sequelize: Sequelize): { Result: ResultModel; Execution: ExecutionModel } {
  const R = class extends Result {};
  R.init(
    {
      id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
      runId: { type: DataTypes.INTEGER, allowNull: true },
      sweepId: { type: DataTypes.INTEGER, allowNull: true },
      submissionId: { type: DataTypes.INTEGER, allowNull: true },
      instanceSetId: { type: DataTypes.INTEGER, allowNull: false },
      mapId: { type: DataTypes.INTEGER, allowNull: false },
      scenarioId: { type: DataTypes.INTEGER, allowNull: false },
      agents: { type: DataTypes.INTEGER, allowNull: false },
      model: { type: DataTypes.STRING(32), allowNull: false },
      params: { type: DataTypes.JSONB, allowNull: false },
      paramHash: { type: DataTypes.CHAR(16), allowNull: false },
      seed: { type: DataTypes.BIGINT, allowNull: false },
      status: { type: DataTypes.STRING(16), allowNull: false },
      reason: { type: DataTypes.TEXT, allowNull: true },
      soc: num(), makespan: num(), turnInclusiveSocMs: num(), turnInclusiveMakespanMs: num(), lowerBound: num(), runtimeMs: num(),
      nodes: { type: DataTypes.INTEGER, allowNull: true },
      nodesExpanded: { type: DataTypes.INTEGER, allowNull: true },
      turns: { type: DataTypes.INTEGER, allowNull: true },
      robotProfile: { type: DataTypes.JSONB, allowNull: false },
      robotProfileHash: { type: DataTypes.CHAR(16), allowNull: false },
      solverVersion: { type: DataTypes.STRING(64), allowNull: false },
      solverCommit: { type: DataTypes.STRING(64), allowNull: false },
      nodeVersion: { type: DataTypes.STRING(32), allowNull: false },
      cpuModel: { type: DataTypes.STRING(200), allowNull: false },
      threadCount: { type: DataTypes.INTEGER, allowNull: false },
      planGz: { type: DataTypes.BLOB, allowNull: true },
      isExecutableAtNominal: { type: DataTypes.BOOLEAN, allowNull: true, field: 'executable_at_nominal' },
      nominalCollisions: { type: DataTypes.INTEGER, allowNull: true },
      createdAt: DataTypes.DATE,
    },
    { sequelize, tableName: 'results', modelName: 'Result', underscored: true, updatedAt: false },
  );
  const E = class extends Execution {};
  E.init(
    {
      id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
      resultId: { type: DataTypes.INTEGER, allowNull: false },
      policy: { type: DataTypes.STRING(32), allowNull: false },
      noise: { type: DataTypes.JSONB, allowNull: false },
      runs: { type: DataTypes.INTEGER, allowNull: false },
      successRate: { type: DataTypes.DOUBLE, allowNull: false },
      collisionsMean: { type: DataTypes.DOUBLE, allowNull: false },
      realisedMakespanMeanMs: num(), realisedMakespanP95Ms: num(), finishSpreadMeanMs: num(),
      metrics: { type: DataTypes.JSONB, allowNull: false },
      createdAt: DataTypes.DATE,
    },
    { sequelize, tableName: 'executions', modelName: 'Execution', underscored: true, updatedAt: false },
  );
  return { Result: R, Execution: E };
}
