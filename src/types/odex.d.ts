// odex ships TypeScript sources but no declaration files that compile under our strict flags;
// tsconfig maps the module here, and src/solve/odexIntegrator.ts gives it its typed face.
declare const odex: unknown;
export default odex;
