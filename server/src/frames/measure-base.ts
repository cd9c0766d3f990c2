// Measuring a base belongs to film-base/; these names stay here while upload code in progress still imports them.
export { measureNegativeBase } from '../film-base/measure-film-base';
export { toMeasuredBase } from '../film-base/measured-base';
