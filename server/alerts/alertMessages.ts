/** The wording of alert notifications and of the alert e-mail. */
import type { AlertKind } from '../../shared/api/alertSchemas'
import type { OutgoingMail } from '../mail/mailer'

const percent = (fraction: number) => `${(fraction * 100).toFixed(1)} %`
const finesseText = (value: number) => value.toFixed(value >= 100 ? 0 : 1)

export interface RuleChange {
  kind: AlertKind
  breached: boolean
  value: number
  threshold: number
  /** For the finesse rule: the 30-day median and the percent that counts as a drop. */
  medianFinesse?: number
  dropPercent?: number
}

/** Title and body of the in-app notification for a rule that went into or out of breach. */
export function describeRuleChange(cavityName: string, change: RuleChange): { title: string; body: string } {
  if (change.kind === 'fraction_below_target') {
    return change.breached
      ? {
          title: `${cavityName}: TEM00 fraction ${percent(change.value)} is below the target ${percent(change.threshold)}`,
          body: 'The newest analysis of this cavity couples less light into TEM00 than its target. Further analyses below the target will not be announced again until the fraction is back at the target.',
        }
      : { title: `${cavityName}: TEM00 fraction back at ${percent(change.value)} (target ${percent(change.threshold)})`, body: 'The newest analysis meets the target again.' }
  }
  const median = change.medianFinesse ?? Number.NaN
  const dropBy = median > 0 ? (1 - change.value / median) * 100 : Number.NaN
  return change.breached
    ? {
        title: `${cavityName}: finesse ${finesseText(change.value)} is ${dropBy.toFixed(0)} % below its 30-day median ${finesseText(median)}`,
        body: `The alert is set at ${change.dropPercent ?? '?'} % below the median (finesse under ${finesseText(change.threshold)}). Dirty or damaged mirrors are a common cause. Further low readings will not be announced again until the finesse recovers.`,
      }
    : { title: `${cavityName}: finesse back at ${finesseText(change.value)} (alert under ${finesseText(change.threshold)})`, body: 'The newest analysis no longer shows a finesse drop.' }
}

/** One e-mail to one watcher for everything one analysis put into breach. */
export function alertMail(input: {
  to: string
  name: string
  cavityName: string
  cavityId: string | null
  analysisId: string | null
  items: Array<{ title: string; body: string }>
  baseUrl: string
}): OutgoingMail {
  const { items, baseUrl } = input
  const subject =
    items.length === 1 ? `Cavitrace alert: ${items[0].title}` : `Cavitrace alert: ${input.cavityName}: ${items.length} alerts`
  return {
    to: input.to,
    subject,
    text: [
      `Hello ${input.name},`,
      '',
      ...items.flatMap((item) => [`• ${item.title}`, `  ${item.body}`, '']),
      ...(input.analysisId ? ['The analysis:', `${baseUrl}/analyses/${input.analysisId}`, ''] : []),
      ...(input.cavityId ? ['The cavity and its history:', `${baseUrl}/cavities/${input.cavityId}`, ''] : []),
      `You receive this because you watch ${input.cavityName}; stop watching it on the cavity's page.`,
    ].join('\n'),
  }
}
