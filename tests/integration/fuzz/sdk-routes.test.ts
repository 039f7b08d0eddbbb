import { fuzzGroup } from './suite';

// Library handlers mounted as routes (file uploads): every table is compared, none is excluded.
fuzzGroup('sdk');
