import { fuzzGroup } from './suite';

// The JSON API and the public documents: every table is compared, none is excluded.
fuzzGroup('api');
