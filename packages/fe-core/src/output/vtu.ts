/**
 * VTK XML writers: one UnstructuredGrid (.vtu) per frame and a collection (.pvd) that lists the
 * frames with their analysis time. Data are written inline in ASCII: larger than binary, but
 * readable, diff-able and accepted by every VTK reader; the files are strings so the core stays
 * free of I/O (the CLI and the worker write them).
 *
 * Points carry the nodal fields (z = 0), cells the element id and the element-mean von Mises
 * stress. Quadratic elements are written as VTK quadratic cells; their node order (corners, then
 * mid-sides 1-2, 2-3, …) is the same as ours.
 */
import type { FieldName } from '@phaseloop/shared';
import type { Problem } from '../assembly/problem';
import { vonMises, type Frame } from './frame';
import { nodalField } from './fields';

const VTK_CELL: Record<string, number> = {
  bar2: 3,
  'beam2-eb': 3,
  'beam2-timo': 3,
  t3: 5,
  q4: 9,
  'q4-eas': 9,
  'q4-bbar': 9,
  t6: 22,
  q8: 23,
};

function fmt(v: number): string {
  return Number.isFinite(v) ? String(v) : '0';
}

function dataArray(name: string, components: number, values: ArrayLike<number>, type = 'Float64', componentNames?: readonly string[]): string {
  const names = componentNames ? componentNames.map((c, i) => ` ComponentName${i}="${c}"`).join('') : '';
  const body: string[] = [];
  for (let i = 0; i < values.length; i += components) {
    const row: string[] = [];
    for (let c = 0; c < components; c++) row.push(fmt(values[i + c]));
    body.push(row.join(' '));
  }
  return `        <DataArray type="${type}" Name="${name}" NumberOfComponents="${components}"${names} format="ascii">\n          ${body.join('\n          ')}\n        </DataArray>\n`;
}

/** VTU text of one frame with the requested nodal fields. */
export function frameToVtu(problem: Problem, frame: Frame, fields: readonly FieldName[]): string {
  const nNodes = problem.nodeCount;
  const nCells = problem.elements.length;
  const points = new Float64Array(3 * nNodes);
  for (let i = 0; i < nNodes; i++) {
    points[3 * i] = problem.coords[2 * i];
    points[3 * i + 1] = problem.coords[2 * i + 1];
  }
  const connectivity: number[] = [];
  const offsets: number[] = [];
  const types: number[] = [];
  const ids: number[] = [];
  const cellVm: number[] = [];
  for (const el of problem.elements) {
    for (const n of el.nodes) connectivity.push(n);
    offsets.push(connectivity.length);
    types.push(VTK_CELL[el.kernel.name]);
    ids.push(el.id);
    let vm = 0;
    for (let p = 0; p < el.points; p++) vm += vonMises(frame.pointStress, 6 * (el.pointOffset + p));
    cellVm.push(vm / el.points);
  }
  let pointData = '';
  for (const name of fields) {
    const f = nodalField(problem, frame, name);
    const nc = f.components.length;
    // VTK orders symmetric tensors xx, yy, zz, xy, yz, xz.
    if (nc === 6) {
      const v = new Float64Array(f.values.length);
      for (let i = 0; i < f.values.length; i += 6) {
        v[i] = f.values[i];
        v[i + 1] = f.values[i + 1];
        v[i + 2] = f.values[i + 2];
        v[i + 3] = f.values[i + 5];
        v[i + 4] = f.values[i + 3];
        v[i + 5] = f.values[i + 4];
      }
      pointData += dataArray(name, 6, v, 'Float64', ['xx', 'yy', 'zz', 'xy', 'yz', 'xz']);
    } else {
      pointData += dataArray(name, nc, f.values, 'Float64', nc > 1 ? f.components : undefined);
    }
  }
  return (
    `<?xml version="1.0"?>\n` +
    `<VTKFile type="UnstructuredGrid" version="1.0" byte_order="LittleEndian" header_type="UInt64">\n` +
    `  <UnstructuredGrid>\n` +
    `    <FieldData>\n` +
    `      <DataArray type="Float64" Name="TimeValue" NumberOfTuples="1" format="ascii">${fmt(frame.time)}</DataArray>\n` +
    `    </FieldData>\n` +
    `    <Piece NumberOfPoints="${nNodes}" NumberOfCells="${nCells}">\n` +
    `      <Points>\n${dataArray('Points', 3, points)}      </Points>\n` +
    `      <Cells>\n${dataArray('connectivity', 1, connectivity, 'Int64')}${dataArray('offsets', 1, offsets, 'Int64')}${dataArray('types', 1, types, 'UInt8')}      </Cells>\n` +
    `      <PointData>\n${pointData}      </PointData>\n` +
    `      <CellData>\n${dataArray('element_id', 1, ids, 'Int64')}${dataArray('vonMises_mean', 1, cellVm)}      </CellData>\n` +
    `    </Piece>\n` +
    `  </UnstructuredGrid>\n` +
    `</VTKFile>\n`
  );
}

/** PVD collection listing frame files (relative names) with their times. */
export function framesToPvd(entries: readonly { time: number; file: string }[]): string {
  const lines = entries.map((e) => `    <DataSet timestep="${fmt(e.time)}" group="" part="0" file="${e.file}"/>`);
  return `<?xml version="1.0"?>\n<VTKFile type="Collection" version="1.0" byte_order="LittleEndian">\n  <Collection>\n${lines.join('\n')}\n  </Collection>\n</VTKFile>\n`;
}

/** File name of frame k inside a VTU folder. */
export function vtuFileName(k: number): string {
  return `frame_${String(k).padStart(4, '0')}.vtu`;
}
