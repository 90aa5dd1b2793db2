// The words of every alert e-mail, as plain text and simple HTML. Pure: no I/O.
import { escapeHtml } from '../mail/html';
import type { MailContent } from '../mail/messages';
import { alertLabels, severityLabels, type AlertEvidence, type AlertKind, type AlertSeverity } from './types';

export interface MailAlert {
  kind: AlertKind;
  severity: AlertSeverity;
  serial: string;
  homeLabel: string | null;
  openedAt: Date;
  resolvedAt?: Date | null;
  evidence: AlertEvidence;
  url: string;
}

const when = (d: Date) => `${d.toISOString().slice(0, 16).replace('T', ' ')} UTC`;
const line = (a: MailAlert) =>
  `${severityLabels[a.severity]} · ${alertLabels[a.kind]} · ${a.serial}${a.homeLabel ? ` (${a.homeLabel})` : ''} · since ${when(a.openedAt)}${a.resolvedAt ? ` · resolved ${when(a.resolvedAt)}` : ''}`;

function page(
  paragraphs: string[],
  items: MailAlert[],
  footer: string,
  button?: { url: string; label: string },
): { text: string; html: string } {
  const text = [
    ...paragraphs,
    ...items.map((a) => `- ${line(a)}\n  ${a.evidence.summary}\n  ${a.url}`),
    ...(button ? [`${button.label}: ${button.url}`] : []),
    footer,
  ].join('\n\n');
  const html =
    `<!doctype html><html><body style="font-family:sans-serif;color:#15232c">${paragraphs.map((p) => `<p>${escapeHtml(p)}</p>`).join('')}` +
    (items.length
      ? `<ul>${items.map((a) => `<li style="margin-bottom:10px"><a href="${escapeHtml(a.url)}">${escapeHtml(line(a))}</a><br><span style="color:#3d4d56">${escapeHtml(a.evidence.summary)}</span></li>`).join('')}</ul>`
      : '') +
    (button
      ? `<p><a href="${escapeHtml(button.url)}" style="background:#1d6f6c;color:#fff;padding:10px 16px;border-radius:6px;text-decoration:none">${escapeHtml(button.label)}</a></p>`
      : '') +
    `<p style="color:#66767f;font-size:12px">${escapeHtml(footer)}</p></body></html>`;
  return { text, html };
}

/** To the company's operators, as soon as severe alerts open. */
export function severeAlertsMail(companyName: string, alerts: MailAlert[], inboxUrl: string): MailContent {
  const first = alerts[0]!;
  const subject =
    alerts.length === 1
      ? `Severe: ${alertLabels[first.kind]} at ${first.serial}`
      : `Severe: ${alerts.length} alerts need attention (${alerts
          .map((a) => a.serial)
          .slice(0, 3)
          .join(', ')}${alerts.length > 3 ? ', …' : ''})`;
  return {
    subject,
    ...page(
      [
        `${alerts.length === 1 ? 'A severe alert has' : `${alerts.length} severe alerts have`} opened for ${companyName}. Each link opens the cylinder at the time of the evidence.`,
      ],
      alerts,
      'You receive these because you are on the service desk. Work on unvented cylinders, immersion heaters and controls is for competent, licensed people under local codes.',
      { url: inboxUrl, label: 'Open the alert inbox' },
    ),
  };
}

/** The once-a-day summary for the operators. */
export function digestMail(
  companyName: string,
  day: string,
  alerts: MailAlert[],
  stillOpen: number,
  inboxUrl: string,
): MailContent {
  return {
    subject: `Heatlayer daily alerts for ${day}: ${alerts.length} new, ${stillOpen} unresolved`,
    ...page(
      [
        `${companyName}: ${alerts.length === 0 ? 'no new alerts' : `${alerts.length} alert${alerts.length === 1 ? '' : 's'} opened`} in the 24 hours to ${day} 07:00 UTC; ${stillOpen} unresolved in all.`,
      ],
      alerts,
      'Severe alerts were also sent when they opened. You receive this digest because you are on the service desk.',
      { url: inboxUrl, label: 'Open the alert inbox' },
    ),
  };
}

/** Plain words for householders, about the kinds that concern them. */
const householderWords: Partial<Record<AlertKind, { subject: string; body: string[] }>> = {
  legionella_risk: {
    subject: 'Your hot water has not been getting hot enough',
    body: [
      'Stored hot water should reach 60 °C regularly to keep bacteria such as legionella under control. Your cylinder has not done so in the past week.',
      'We have told your installer, who will look at the settings. You do not need to do anything now. Water at 60 °C can scald: take care at the taps.',
    ],
  },
  low_hot_water: {
    subject: 'You may run short of hot water soon',
    body: [
      'Your cylinder holds less hot water than your home usually uses over the next couple of hours. You can boost it from your Heatlayer page, or wait: it will heat up again.',
    ],
  },
  immersion_heavy: {
    subject: 'Your electric immersion heater is doing much of the work',
    body: [
      'Over the past week the electric immersion heater, rather than the heat pump, has heated much of your hot water. That usually costs more. We have told your installer, who will check why.',
    ],
  },
};

export function householderMail(kind: AlertKind, homeUrl: string, preferencesUrl: string): MailContent | null {
  const w = householderWords[kind];
  if (!w) return null;
  return {
    subject: w.subject,
    ...page(w.body, [], `You can stop these messages at any time: ${preferencesUrl}`, {
      url: homeUrl,
      label: 'See your hot water',
    }),
  };
}
