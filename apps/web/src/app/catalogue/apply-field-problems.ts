// Kept so pages outside the catalogue that still import from here go on compiling; new code imports from forms/.
export { applyFieldProblems, bodyField } from '../forms/apply-field-problems';
