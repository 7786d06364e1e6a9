/**
 * Uploaded measurements (DSC traces, isothermal tensile curves) kept as the lab sent them; parsing
 * and the F2004/F2516 evaluations happen in calibration, which reads them back from here.
 */
import { z } from 'zod';
import multer from 'multer';
import { QueryTypes } from 'sequelize';
import type { RequestHandler } from 'express';
import type { ApiRouter } from '../http/route';
import type { AppContext } from '../context';
import { HttpError, notFound } from '../http/errors';
import { idParams, projectParams, uuid } from '../http/common-schemas';
import { requireProject, requireProjectOf } from '../projects/projects.service';
import { audit } from '../audit/audit.service';

export const MAX_TEST_DATA_BYTES = 20 * 1024 * 1024;

const testDataDto = z.object({
  id: uuid, projectId: uuid, name: z.string(), kind: z.enum(['dsc', 'tensile', 'other']), temperature: z.number().nullable(),
  notes: z.string(), filename: z.string(), contentType: z.string(), size: z.number(), isDemo: z.boolean(), createdAt: z.string(),
});
type TestDataDto = z.infer<typeof testDataDto>;

const COLUMNS = `id, project_id AS "projectId", name, kind, temperature, notes, file_name AS "filename", content_type AS "contentType", size, is_demo AS "isDemo", created_at AS "createdAt"`;

export const uploadSingleFile: RequestHandler = multer({ storage: multer.memoryStorage(), limits: { fileSize: MAX_TEST_DATA_BYTES, files: 1 } }).single('file');

export function registerTestDataRoutes(api: ApiRouter, ctx: AppContext): void {
  const tag = 'Test data';
  const fix = (r: TestDataDto & { createdAt: unknown }) => ({ ...r, createdAt: new Date(r.createdAt as string).toISOString() });
  api
    .add({
      method: 'get', path: '/projects/:projectId/test-data', tag, access: 'user', summary: 'Uploaded measurements of a project',
      params: projectParams, response: z.object({ items: z.array(testDataDto) }),
      handler: async ({ user, params }) => {
        await requireProject(user, params.projectId);
        const rows = await ctx.sequelize.query<TestDataDto>(`SELECT ${COLUMNS} FROM test_data WHERE project_id = :projectId ORDER BY created_at DESC`, { replacements: params, type: QueryTypes.SELECT });
        return { items: rows.map(fix) };
      },
    })
    .add({
      method: 'post', path: '/projects/:projectId/test-data', tag, access: 'user', description: 'Project analysts and admins.',
      summary: 'Upload a CSV (multipart: file, name, kind = dsc | tensile | other, temperature in °C for tensile)',
      params: projectParams,
      before: [uploadSingleFile],
      bodyType: 'multipart/form-data',
      body: z.object({
        name: z.string().trim().min(1).max(200),
        kind: z.enum(['dsc', 'tensile', 'other']),
        temperature: z.coerce.number().finite().optional(),
        notes: z.string().max(5000).default(''),
      }),
      response: testDataDto,
      handler: async ({ user, params, body, req }) => {
        await requireProject(user, params.projectId, 'testdata:write');
        const file = req.file;
        if (!file) throw new HttpError(422, 'Attach the file as the multipart field "file"', 'validation_failed');
        if (body.kind === 'tensile' && body.temperature === undefined) throw new HttpError(422, 'A tensile curve needs its test temperature (°C)', 'validation_failed');
        const [row] = await ctx.sequelize.query<TestDataDto>(
          `INSERT INTO test_data (project_id, name, kind, temperature, notes, file_name, content_type, size, content, uploaded_by)
           VALUES (:projectId, :name, :kind, :temperature, :notes, :fileName, :contentType, :size, :content, :userId) RETURNING ${COLUMNS}`,
          {
            replacements: { ...params, ...body, temperature: body.temperature ?? null, fileName: file.originalname, contentType: file.mimetype || 'text/csv', size: file.size, content: file.buffer, userId: user.id },
            type: QueryTypes.SELECT,
          },
        );
        await audit(ctx.sequelize, { userId: user.id, projectId: params.projectId, action: 'testdata.upload', targetType: 'test-data', targetId: row.id, detail: { name: body.name, kind: body.kind } });
        return fix(row);
      },
    })
    .add({
      method: 'get', path: '/test-data/:id/content', tag, access: 'user', summary: 'Download the uploaded file', raw: true,
      params: idParams,
      handler: async ({ user, params, res }) => {
        const [row] = await ctx.sequelize.query<{ projectId: string; fileName: string; contentType: string; content: Buffer }>(
          `SELECT project_id AS "projectId", file_name AS "fileName", content_type AS "contentType", content FROM test_data WHERE id = :id`,
          { replacements: params, type: QueryTypes.SELECT },
        );
        if (!row) throw notFound('Test data');
        await requireProjectOf(user, row.projectId, 'project:read', 'Test data');
        res.setHeader('Content-Type', row.contentType);
        res.setHeader('Content-Disposition', `attachment; filename="${row.fileName.replace(/[^A-Za-z0-9._-]/g, '_')}"`);
        res.send(row.content);
      },
    });
}
