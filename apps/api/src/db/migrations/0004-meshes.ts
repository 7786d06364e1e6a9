/**
 * Uploaded meshes (Gmsh .msh). The parsed mesh is kept as jsonb for the study builder, beside the
 * file as uploaded, so a later importer can read it again without asking the analyst for it.
 */
import type { Migration } from '../migrate';

export const meshesSchema: Migration = {
  name: '0004-meshes',
  async up({ context: sql }) {
    await sql(`
CREATE TABLE meshes (
  id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
  project_id uuid NOT NULL REFERENCES projects(id) ON DELETE CASCADE,
  name text NOT NULL,
  file_name text NOT NULL,
  -- Gmsh format version of the file.
  format text NOT NULL CHECK (format IN ('2.2', '4.1')),
  size integer NOT NULL CHECK (size >= 0),
  node_count integer NOT NULL CHECK (node_count >= 0),
  element_count integer NOT NULL CHECK (element_count >= 0),
  -- Element types, bounding box, physical groups and import warnings, as shown after the upload.
  summary jsonb NOT NULL,
  -- Nodes, elements and named sets in model-format shapes.
  mesh jsonb NOT NULL,
  content text NOT NULL,
  uploaded_by uuid REFERENCES users(id) ON DELETE SET NULL,
  created_at timestamptz NOT NULL DEFAULT now(),
  deleted_at timestamptz
);
CREATE INDEX meshes_project_idx ON meshes(project_id, created_at DESC);
`);
  },
};
