// Every migration, in order. Listed by hand (not globbed) so they travel in the bundle.
import * as initial from './0001-initial.ts';

export const MIGRATIONS = [{ name: '0001-initial', ...initial }];
