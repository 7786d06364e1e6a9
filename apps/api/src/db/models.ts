import type { Sequelize } from 'sequelize';
import { initUserModels } from '../users/users.model';
import { initProjectModels } from '../projects/projects.model';
import { initMaterialModels } from '../materials/materials.model';
import { initStudyModels } from '../studies/studies.model';
import { initRunModels } from '../runs/runs.model';
import { initMeshModels } from '../meshes/meshes.model';

/** Binds every model to this Sequelize instance (one per process). */
export function initModels(sequelize: Sequelize): void {
  initUserModels(sequelize);
  initProjectModels(sequelize);
  initMaterialModels(sequelize);
  initStudyModels(sequelize);
  initRunModels(sequelize);
  initMeshModels(sequelize);
}
