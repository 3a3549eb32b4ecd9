/** Project files (docs/project-format.md): schema, migration, the one opener and the writer. */
export * from './archive';
export { checkProjectJson, DOCUMENT_LIMITS, ProjectSchema, type ProjectJson, type SchemaProblem } from './schema';
export { readZip, writeZip } from './zip';
