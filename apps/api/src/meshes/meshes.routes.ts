import { z } from 'zod';
import multer from 'multer';
import type { RequestHandler } from 'express';
import { meshDetailSchema, meshSummarySchema } from '@phaseloop/shared';
import type { ApiRouter } from '../http/route';
import type { AppContext } from '../context';
import { HttpError } from '../http/errors';
import { idParams, projectParams } from '../http/common-schemas';
import type { SessionUser } from '../auth/session-user';
import { requireProject } from '../projects/projects.service';
import { getMesh, listMeshes, uploadMesh } from './meshes.service';

/** "20 MB", "512 KB": the limit as an analyst reads it in the refusal. */
export function formatBytes(bytes: number): string {
  if (bytes >= 1024 * 1024) return `${+(bytes / (1024 * 1024)).toFixed(1)} MB`;
  if (bytes >= 1024) return `${+(bytes / 1024).toFixed(1)} KB`;
  return `${bytes} bytes`;
}

/**
 * Checks the role before multer reads the body, so a member who may not upload (or a non-member)
 * is refused without the API buffering a file of up to the size limit first.
 */
const mayUpload: RequestHandler = async (req, _res, next) => {
  const params = projectParams.safeParse(req.params);
  // A malformed id is left to the route's own parameter validation (400).
  if (params.success) await requireProject(req.user as SessionUser, params.data.projectId, 'study:write');
  next();
};

/** multer in memory with the size limit, its refusals turned into our error shape. */
function receiveMeshFile(maxBytes: number): RequestHandler {
  const single = multer({ storage: multer.memoryStorage(), limits: { fileSize: maxBytes, files: 1, fields: 10 } }).single('file');
  return (req, res, next) => {
    single(req, res, (err: unknown) => {
      if (!err) return next();
      if (err instanceof multer.MulterError && err.code === 'LIMIT_FILE_SIZE') {
        return next(new HttpError(413, `The file is larger than the ${formatBytes(maxBytes)} limit for meshes`, 'bad_request', [{ path: 'file', message: `at most ${formatBytes(maxBytes)}` }]));
      }
      if (err instanceof multer.MulterError && err.code === 'LIMIT_UNEXPECTED_FILE') {
        return next(new HttpError(400, `Send one mesh as the multipart field "file" (got "${err.field ?? ''}")`, 'bad_request', [{ path: err.field ?? 'file', message: 'unexpected file field' }]));
      }
      const message = err instanceof Error ? err.message : 'malformed upload';
      return next(new HttpError(400, `The upload could not be read: ${message}`, 'bad_request'));
    });
  };
}

export function registerMeshRoutes(api: ApiRouter, ctx: AppContext): void {
  const tag = 'Meshes';
  api
    .add({
      method: 'get', path: '/projects/:projectId/meshes', tag, access: 'user', summary: 'Meshes uploaded to a project (summaries, newest first)',
      params: projectParams, response: z.object({ items: z.array(meshSummarySchema) }),
      handler: async ({ user, params }) => ({ items: await listMeshes(user, params.projectId) }),
    })
    .add({
      method: 'post', path: '/projects/:projectId/meshes', tag, access: 'user',
      description: `Project analysts and admins. Multipart: file (Gmsh .msh, ASCII 2.2 or 4.1, at most ${formatBytes(ctx.config.MESH_MAX_BYTES)}), optional name. A file that cannot be read answers 400 naming the line.`,
      summary: 'Upload a Gmsh .msh mesh; physical groups become named sets',
      params: projectParams,
      before: [mayUpload, receiveMeshFile(ctx.config.MESH_MAX_BYTES)],
      bodyType: 'multipart/form-data',
      body: z.object({ name: z.string().max(200).optional() }),
      response: meshSummarySchema,
      handler: async ({ user, params, body, req }) => {
        const file = req.file;
        if (!file) throw new HttpError(422, 'Attach the mesh as the multipart field "file"', 'validation_failed', [{ path: 'file', message: 'required' }]);
        return uploadMesh(ctx.sequelize, user, params.projectId, { originalName: file.originalname, bytes: file.buffer, name: body.name });
      },
    })
    .add({
      method: 'get', path: '/meshes/:id', tag, access: 'user', summary: 'One uploaded mesh: its summary and the parsed nodes, elements and sets',
      params: idParams, response: meshDetailSchema,
      handler: ({ user, params }) => getMesh(user, params.id),
    });
}
