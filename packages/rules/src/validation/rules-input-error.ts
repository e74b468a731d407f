// A bad input to a rule throws this, never a half answer. `fields` maps a dotted path of the input
// (e.g. `specimens.0.discontinuities.1.size.value`) to a message the API can return as a 400 and a form
// can show beside the field. It is a RangeError so that parseLength's callers can catch either name.
export class RulesInputError extends RangeError {
  readonly fields: Record<string, string>;

  constructor(fields: Record<string, string>, message?: string) {
    const first = Object.entries(fields)[0];
    super(message ?? (first ? `${first[0] || 'input'}: ${first[1]}` : 'Invalid input'));
    this.name = 'RulesInputError';
    this.fields = fields;
  }

  static field(path: string, message: string): RulesInputError {
    return new RulesInputError({ [path]: message });
  }
}
