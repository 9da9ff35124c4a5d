/** Bad input to a rules function: names the offending field so a form or an API can point at it. */
export class RulesInputError extends Error {
  readonly field: string;

  constructor(field: string, message: string) {
    super(message);
    this.name = 'RulesInputError';
    this.field = field;
  }
}

/** A reading that cannot be graded (negative, not a number, beyond the gauge's range): refused, never rounded into range. */
export class ReadingValidationError extends RulesInputError {
  constructor(field: string, message: string) {
    super(field, message);
    this.name = 'ReadingValidationError';
  }
}
