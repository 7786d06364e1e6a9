/**
 * Uploaded meshes: a Gmsh .msh file is parsed by fe-core once, at upload, and stored both as the
 * file and as the parsed mesh, so the study builder never parses text in the browser and a bad
 * file is refused before anything is stored.
 */
import { Op, type Sequelize } from 'sequelize';
import { GmshFormatError, parseGmsh, type GmshMesh } from '@phaseloop/fe-core';
import { meshGroups, type MeshDetail, type MeshPartData, type MeshSummary } from '@phaseloop/shared';
import { HttpError, notFound } from '../http/errors';
import type { SessionUser } from '../auth/session-user';
import { requireProject, requireProjectOf } from '../projects/projects.service';
import { audit } from '../audit/audit.service';
import { User } from '../users/users.model';
import { Mesh, type StoredMeshSummary } from './meshes.model';

export interface MeshUpload {
  originalName: string;
  bytes: Buffer;
  /** Name to show; the file name without its extension when empty. */
  name?: string;
}

/** The parsed mesh and the summary shown after the upload, or a 400 naming the line at fault. */
export function importMesh(fileName: string, text: string): { mesh: MeshPartData; summary: StoredMeshSummary; format: GmshMesh['version'] } {
  // PostgreSQL text cannot hold NUL, and an ASCII mesh never has one: refuse it here, by line,
  // rather than fail on insert (the parser would skip it inside a section it does not read).
  const nul = text.indexOf('\u0000');
  if (nul >= 0) {
    const line = text.slice(0, nul).split('\n').length;
    throw new HttpError(400, `${fileName} could not be read: line ${line}: the file holds binary data (a NUL byte); export the mesh as ASCII`, 'bad_request', [{ path: 'file', line, message: 'binary data' }]);
  }
  let parsed: GmshMesh;
  try {
    parsed = parseGmsh(text);
  } catch (err) {
    if (err instanceof GmshFormatError) {
      throw new HttpError(400, `${fileName} could not be read: ${err.message}`, 'bad_request', [{ path: 'file', line: err.line, message: err.message }]);
    }
    throw err;
  }
  // A mesh of lines alone would become bars or beams, which need section data the builder for
  // uploaded meshes does not ask for; say so now rather than at save time.
  const planar = parsed.elements.filter((e) => e.type !== 'bar2' && e.type !== 'beam2');
  if (planar.length === 0) {
    throw new HttpError(400, `${fileName} holds only line elements: upload a 2D mesh of triangles or quadrilaterals (lines may be added as physical curve groups for boundary conditions)`, 'bad_request', [{ path: 'file', message: 'no 2D elements' }]);
  }
  const mesh: MeshPartData = { nodes: parsed.nodes, elements: parsed.elements, nodeSets: parsed.nodeSets, edgeSets: parsed.edgeSets, elementSets: parsed.elementSets };
  return { mesh, summary: summarise(mesh, parsed.warnings), format: parsed.version };
}

function summarise(mesh: MeshPartData, warnings: string[]): StoredMeshSummary {
  const elementTypes: Record<string, number> = {};
  for (const e of mesh.elements) elementTypes[e.type] = (elementTypes[e.type] ?? 0) + 1;
  const bounds = { minX: Infinity, maxX: -Infinity, minY: Infinity, maxY: -Infinity };
  for (const n of mesh.nodes) {
    bounds.minX = Math.min(bounds.minX, n.x); bounds.maxX = Math.max(bounds.maxX, n.x);
    bounds.minY = Math.min(bounds.minY, n.y); bounds.maxY = Math.max(bounds.maxY, n.y);
  }
  return { elementTypes, bounds, groups: meshGroups(mesh), warnings };
}

export function toMeshSummary(m: Mesh, uploader: { id: string; name: string } | null): MeshSummary {
  return {
    id: m.id, projectId: m.projectId, name: m.name, fileName: m.fileName, format: m.format, size: m.size,
    nodeCount: m.nodeCount, elementCount: m.elementCount, ...m.summary, uploadedBy: uploader, createdAt: m.createdAt.toISOString(),
  };
}

async function uploaderOf(m: Mesh): Promise<{ id: string; name: string } | null> {
  if (!m.uploadedBy) return null;
  const u = await User.findByPk(m.uploadedBy, { attributes: ['id', 'name'] });
  return u ? { id: u.id, name: u.name } : null;
}

export async function uploadMesh(sequelize: Sequelize, user: SessionUser, projectId: string, upload: MeshUpload): Promise<MeshSummary> {
  await requireProject(user, projectId, 'study:write');
  const { originalName, bytes } = upload;
  if (!/\.msh$/i.test(originalName)) {
    throw new HttpError(400, `Only Gmsh .msh files are accepted; "${originalName}" is not one`, 'bad_request', [{ path: 'file', message: 'expected a .msh file' }]);
  }
  const { mesh, summary, format } = importMesh(originalName, bytes.toString('utf8'));
  const name = upload.name?.trim() || originalName.replace(/\.msh$/i, '');
  const created = await Mesh.create({
    projectId, name, fileName: originalName, format, size: bytes.length, nodeCount: mesh.nodes.length, elementCount: mesh.elements.length,
    summary, mesh, content: bytes.toString('utf8'), uploadedBy: user.id,
  });
  await audit(sequelize, { userId: user.id, projectId, action: 'mesh.upload', targetType: 'mesh', targetId: created.id, detail: { name, nodes: mesh.nodes.length } });
  return toMeshSummary(created, { id: user.id, name: user.name });
}

export async function listMeshes(user: SessionUser, projectId: string): Promise<MeshSummary[]> {
  await requireProject(user, projectId);
  // The parsed mesh and the file can be megabytes each: the list leaves them out.
  const rows = await Mesh.findAll({ where: { projectId, deletedAt: null }, order: [['createdAt', 'DESC']], attributes: { exclude: ['mesh', 'content'] } });
  const uploaders = await User.findAll({ where: { id: { [Op.in]: rows.map((r) => r.uploadedBy).filter((id): id is string => id !== null) } }, attributes: ['id', 'name'] });
  const byId = new Map(uploaders.map((u) => [u.id, { id: u.id, name: u.name }]));
  return rows.map((r) => toMeshSummary(r, r.uploadedBy ? (byId.get(r.uploadedBy) ?? null) : null));
}

export async function getMesh(user: SessionUser, id: string): Promise<MeshDetail> {
  const m = await Mesh.findByPk(id, { attributes: { exclude: ['content'] } });
  if (!m || m.deletedAt) throw notFound('Mesh');
  await requireProjectOf(user, m.projectId, 'project:read', 'Mesh');
  return { ...toMeshSummary(m, await uploaderOf(m)), mesh: m.mesh };
}
