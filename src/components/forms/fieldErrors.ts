/**
 * One message per form field from a schema's issues, all in one style: a sentence with a capital and a full stop,
 * "Name is required." for a missing value, the schema's own words otherwise ("Name must not be empty.").
 */
export interface FieldIssue {
  path: PropertyKey[]
  code: string
  message: string
  input?: unknown
}

const sentence = (text: string) => {
  const trimmed = text.trim()
  const capital = trimmed.charAt(0).toUpperCase() + trimmed.slice(1)
  return /[.!?]$/.test(capital) ? capital : `${capital}.`
}

/** `labels` names the fields as the form shows them (e.g. { focalLengthMm: 'Focal length' }). */
export function fieldErrorsOf(issues: readonly FieldIssue[], labels: Readonly<Record<string, string>> = {}): Record<string, string> {
  const errors: Record<string, string> = {}
  for (const issue of issues) {
    const key = String(issue.path[0] ?? 'form')
    const missing = issue.code === 'invalid_type' && issue.input === undefined
    errors[key] ??= missing ? `${labels[key] ?? key} is required.` : sentence(issue.message)
  }
  return errors
}
