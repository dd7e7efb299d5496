/**
 * CSV sent to a browser may be opened in a spreadsheet, which runs a cell that starts with
 * = + - @ (also after leading tabs, spaces or a carriage return) as a formula (OWASP, "CSV
 * Injection"). Such cells get a leading apostrophe, so spreadsheets show them as text.
 * A negative number ("-0.25", "-0,25") is data and stays as it is.
 *
 * Test-stand files come with commas, semicolons or tabs, and delimiter guessing is
 * unreliable on short files with decimal commas, so a field start is taken after ANY of
 * those delimiters (or a line break), quoted or not. Inside a quoted text that only adds an
 * apostrophe to the text; the numbers, delimiter and line ends are untouched.
 */

/** A field start (line start or a delimiter, then an optional opening quote) followed by a formula. */
const FIELD_WITH_FORMULA = /(^|[,;\t|\n])("?)(?=[ \t\r]*(?:[=+@]|-(?![\d.,\s]|$)))/g

export function neutraliseCsvFormulae(text: string): string {
  return text.replace(FIELD_WITH_FORMULA, "$1$2'")
}
