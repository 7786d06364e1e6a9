/** Structured meshers (Gmsh import comes later). */
export * from './structured';
