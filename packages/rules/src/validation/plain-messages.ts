// The messages a person sees when zod refuses a value and the schema names no message of its own: in
// plain words, never the internal ids zod would list ('Invalid option: expected one of "asme-ix"|…') nor
// its type names ('expected string, received undefined'). A message written on a schema still wins.
import { z } from 'zod';

z.config({
  customError: (issue) => {
    if (issue.code === 'invalid_value') return 'Choose one from the list';
    if (issue.code === 'invalid_union' || issue.code === 'invalid_key') return 'Choose one from the list';
    if (issue.code === 'invalid_type') return issue.input === undefined || issue.input === null ? 'Required' : 'Enter a value of the right kind';
    if (issue.code === 'invalid_format' && issue.format === 'uuid') return 'Choose one from the list';
    return undefined;
  },
});
