/** Every Sequelize model of the app, bound to one connection. Add a feature's models here. */
import type { Sequelize } from 'sequelize';
import { defineInstanceSet, type InstanceSetModel } from '../instance-sets/instance-set.model';
import { defineMapFile, type MapFileModel } from '../instance-sets/map-file.model';
import { defineScenarioFile, type ScenarioFileModel } from '../instance-sets/scenario-file.model';
import { defineResultModels, type ExecutionModel, type ResultModel } from '../sweeps/result.model';
import { defineSweep, type SweepModel } from '../sweeps/sweep.model';
import { defineUser, type UserModel } from '../users/user.model';

/** The models of one app instance. */
export interface Models {
  readonly User: UserModel;
  readonly InstanceSet: InstanceSetModel;
  readonly MapFile: MapFileModel;
  readonly ScenarioFile: ScenarioFileModel;
  readonly Sweep: SweepModel;
  readonly Result: ResultModel;
  readonly Execution: ExecutionModel;
}

/** Defines all models on `sequelize` (the schema itself comes from migrations). */
export function defineModels(sequelize: Sequelize): Models {
  return {
    User: defineUser(sequelize),
    InstanceSet: defineInstanceSet(sequelize),
    MapFile: defineMapFile(sequelize),
    ScenarioFile: defineScenarioFile(sequelize),
    Sweep: defineSweep(sequelize),
    ...defineResultModels(sequelize),
  };
}
