// The one direction imports point in src/ (see ../shared/STYLE.md and DEVELOPERS.md):
//   shared <- hydraulics, geometry <- screening <- input, output <- report <- index <- cli
// `npm test` runs this check before the tests.
const folder = (name) => `^src/${name}/`;
const outside = (allowed) => `^src/(?!(${allowed.join('|')})/)[^/]+/|^src/index\\.ts$`;

/** @type {import('dependency-cruiser').IConfiguration} */
module.exports = {
  forbidden: [
    { name: 'shared-imports-nothing-of-ours', severity: 'error', from: { path: folder('shared') }, to: { path: outside(['shared']) } },
    { name: 'hydraulics-imports-shared-only', severity: 'error', from: { path: folder('hydraulics') }, to: { path: outside(['shared', 'hydraulics']) } },
    { name: 'geometry-imports-shared-only', severity: 'error', from: { path: folder('geometry') }, to: { path: outside(['shared', 'geometry']) } },
    { name: 'screening-below-readers-and-writers', severity: 'error', from: { path: folder('screening') }, to: { path: outside(['shared', 'hydraulics', 'geometry', 'screening']) } },
    { name: 'input-knows-no-output', severity: 'error', from: { path: folder('input') }, to: { path: outside(['shared', 'hydraulics', 'geometry', 'screening', 'input']) } },
    { name: 'output-knows-no-input', severity: 'error', from: { path: folder('output') }, to: { path: outside(['shared', 'hydraulics', 'geometry', 'screening', 'output']) } },
    { name: 'report-reads-output-never-input', severity: 'error', from: { path: folder('report') }, to: { path: outside(['shared', 'hydraulics', 'geometry', 'screening', 'output', 'report']) } },
    { name: 'index-below-cli', severity: 'error', from: { path: '^src/index\\.ts$' }, to: { path: '^src/cli/' } },
    { name: 'cli-uses-the-library-api-only', severity: 'error', from: { path: folder('cli') }, to: { path: '^src/(?!cli/)[^/]+/' } },
    { name: 'no-cycles', severity: 'error', from: {}, to: { circular: true } },
  ],
  options: {
    doNotFollow: { path: 'node_modules' },
    exclude: { path: 'node_modules' },
    tsPreCompilationDeps: true,
    tsConfig: { fileName: 'tsconfig.json' },
  },
};
