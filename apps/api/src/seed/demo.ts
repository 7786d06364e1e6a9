/**
 * The demo team: invented people, alloys, studies and test data for trying Phaseloop out. Every
 * name says "(demo)" or "(demo values)", and no number here describes a real alloy or product.
 * Safe to run again: an existing demo admin means the demo is already there.
 */
import { templates } from '@phaseloop/fe-core';
import type { Sequelize } from 'sequelize';
import { QueryTypes } from 'sequelize';
import { materialParamsSchema, type MaterialParams } from '@phaseloop/shared';
import { hashPassword } from '../auth/password';
import type { Role } from '../auth/permissions';
import { User } from '../users/users.model';
import { Project, ProjectMember } from '../projects/projects.model';
import { Material, MaterialVersion } from '../materials/materials.model';
import { Study } from '../studies/studies.model';

export const DEMO_PASSWORD = 'phaseloop-demo';

export const DEMO_USERS: { email: string; name: string; role: Role; isAdmin: boolean }[] = [
  { email: 'admin@demo.phaseloop.test', name: 'Ada Admin (demo)', role: 'admin', isAdmin: true },
  { email: 'analyst@demo.phaseloop.test', name: 'Ana Analyst (demo)', role: 'analyst', isAdmin: false },
  { email: 'reviewer@demo.phaseloop.test', name: 'Rui Reviewer (demo)', role: 'reviewer', isAdmin: false },
  { email: 'viewer@demo.phaseloop.test', name: 'Vic Viewer (demo)', role: 'viewer', isAdmin: false },
];

export const DEMO_STENT_PROJECT = 'Demo stent frame (demo values)';
export const DEMO_ACTUATOR_PROJECT = 'Demo actuator wire (demo values)';

/** Invented superelastic set (Af below body temperature). Units: MPa, °C. */
const demoSuperelastic: MaterialParams = materialParamsSchema.parse({
  model: 'souza-auricchio', E: 52_000, nu: 0.33, alpha: 0, T_ref: 20,
  h: 800, beta: 6.0, T0: -20, R: 50, eps_L: 0.05, asymmetry: 0,
});

/** Invented actuator set (Af well above room temperature). Units: MPa, °C. */
const demoActuator: MaterialParams = materialParamsSchema.parse({
  model: 'lagoudas2012', E_A: 60_000, E_M: 40_000, nu: 0.33, alpha_A: 0, alpha_M: 0, T_ref: 20,
  Ms0: 52, Mf0: 40, As0: 63, Af0: 78, C_M: 7.5, C_A: 8.0, sigma_star: 150,
  H_min: 0.01, H_sat: 0.04, k_t: 0.015, n1: 0.2, n2: 0.2, n3: 0.2, n4: 0.2,
});

/** A small invented DSC trace: heat flow (W/g) against temperature (°C), cooling then heating. */
export function demoDscCsv(): string {
  const lines = ['# demo values (invented), not a measurement', 'segment,temperature_C,heat_flow_W_per_g'];
  const peak = (T: number, centre: number, width: number, height: number) => height * Math.exp(-(((T - centre) / width) ** 2));
  for (let T = 60; T >= -60; T -= 2) lines.push(`cooling,${T},${(0.02 + peak(T, -5, 8, 0.6)).toFixed(4)}`);
  for (let T = -60; T <= 60; T += 2) lines.push(`heating,${T},${(-0.02 - peak(T, 12, 7, 0.55)).toFixed(4)}`);
  return lines.join('\n') + '\n';
}

export async function seedDemo(sequelize: Sequelize): Promise<{ created: boolean }> {
  if (await User.findOne({ where: { email: DEMO_USERS[0]!.email } })) return { created: false };
  await sequelize.transaction(async (transaction) => {
    const passwordHash = await hashPassword(DEMO_PASSWORD);
    const users = new Map<Role, User>();
    for (const u of DEMO_USERS) {
      users.set(u.role, await User.create({ email: u.email, name: u.name, passwordHash, isAdmin: u.isAdmin, isDemo: true }, { transaction }));
    }
    const admin = users.get('admin')!;
    const analyst = users.get('analyst')!;
    const reviewer = users.get('reviewer')!;

    const stent = await Project.create(
      { name: DEMO_STENT_PROJECT, description: 'Superelastic strut cell of an invented self-expanding frame. All numbers are demo values.', isDemo: true, createdBy: admin.id },
      { transaction },
    );
    const actuator = await Project.create(
      { name: DEMO_ACTUATOR_PROJECT, description: 'Invented wire actuator lifting a dead load on heating. All numbers are demo values.', isDemo: true, createdBy: admin.id },
      { transaction },
    );
    for (const [role, user] of users) await ProjectMember.create({ projectId: stent.id, userId: user.id, role }, { transaction });
    await ProjectMember.create({ projectId: actuator.id, userId: admin.id, role: 'admin' }, { transaction });
    await ProjectMember.create({ projectId: actuator.id, userId: analyst.id, role: 'analyst' }, { transaction });

    const se = await Material.create({ projectId: stent.id, name: 'Demo superelastic NiTi (demo values)', description: 'Invented constants for trying the app.', isDemo: true, createdBy: analyst.id }, { transaction });
    const seV = await MaterialVersion.create(
      { materialId: se.id, version: 1, params: demoSuperelastic, provenance: { source: 'demo values (invented)' }, notes: 'Demo values.', createdBy: analyst.id, status: 'approved', reviewedBy: reviewer.id, reviewedAt: new Date(), reviewReason: 'Demo approval.' },
      { transaction },
    );
    const act = await Material.create({ projectId: actuator.id, name: 'Demo actuator NiTi (demo values)', description: 'Invented constants for trying the app.', isDemo: true, createdBy: analyst.id }, { transaction });
    const actV = await MaterialVersion.create(
      { materialId: act.id, version: 1, params: demoActuator, provenance: { source: 'demo values (invented)' }, notes: 'Demo values.', createdBy: analyst.id },
      { transaction },
    );

    await Study.create(
      {
        projectId: stent.id, name: 'Strut cell deployment (demo)', description: 'Crimp, release into the vessel and pulsate one strut cell (template defaults, demo values).', isDemo: true, createdBy: analyst.id,
        definition: templateDefinition('stent-strut', se.id, seV.id),
      },
      { transaction },
    );
    await Study.create(
      {
        projectId: actuator.id, name: 'Actuator wire thermal cycle (demo)', description: 'Stroke of a wire under a dead load, heated and cooled (template defaults, demo values).', isDemo: true, createdBy: analyst.id,
        definition: templateDefinition('actuator-wire', act.id, actV.id),
      },
      { transaction },
    );

    const csv = Buffer.from(demoDscCsv(), 'utf8');
    await sequelize.query(
      `INSERT INTO test_data (project_id, name, kind, temperature, notes, file_name, content_type, size, content, uploaded_by, is_demo)
       VALUES (:projectId, :name, 'dsc', NULL, :notes, 'demo-dsc.csv', 'text/csv', :size, :content, :userId, true)`,
      { replacements: { projectId: stent.id, name: 'DSC trace, demo lot (demo values)', notes: 'Invented trace.', size: csv.length, content: csv, userId: analyst.id }, type: QueryTypes.INSERT, transaction },
    );
  });
  return { created: true };
}

/**
 * A demo study as the study editor saves one: the template's parameters (defaults, demo values)
 * to reopen the form, and the solver model built from them with its material taken from the
 * project library by version.
 */
function templateDefinition(name: 'stent-strut' | 'actuator-wire', materialId: string, versionId: string): Record<string, unknown> & { materials: { region: string; materialVersionId: string }[] } {
  const template = templates[name];
  const params = template.paramsSchema.parse({ template: name });
  const model = template.build(params);
  const reference = { materialVersionId: versionId };
  return {
    template: name, params, materialId,
    materials: [{ region: 'all', materialVersionId: versionId }],
    model: { ...model, materials: Object.fromEntries(Object.keys(model.materials).map((key) => [key, reference])) },
    estimatedNodes: model.nodes.length,
  };
}
