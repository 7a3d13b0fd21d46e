// Mail markup that renders alike in common clients: tables for layout, inline styles only, no
// remote images or fonts, and a width that fits a phone. Pure functions, used by every message.

const INK = '#2c2619'
const MUTED = '#5e5340'
const MOSS = '#24463a'
const PAPER = '#fbf8f1'
const FONT = 'Georgia, \'Times New Roman\', serif'
const SANS = 'Helvetica, Arial, sans-serif'

/** Escapes text for HTML, attributes included. */
export function escapeHtml(text: string): string {
  return text.replace(/&/g, '&amp;').replace(/</g, '&lt;').replace(/>/g, '&gt;').replace(/"/g, '&quot;').replace(/'/g, '&#39;')
}

/** A paragraph of body text. */
export function mailParagraph(html: string): string {
  return `<p style="margin:0 0 14px 0;font-family:${SANS};font-size:15px;line-height:22px;color:${INK};">${html}</p>`
}

/** A section heading inside a message. */
export function mailHeading(text: string): string {
  return `<h2 style="margin:22px 0 8px 0;font-family:${FONT};font-size:19px;line-height:24px;font-weight:normal;color:${MOSS};">${escapeHtml(text)}</h2>`
}

/** A button-like link, as a one-cell table so Outlook keeps its padding. */
export function mailButton(href: string, label: string): string {
  return `<table role="presentation" cellpadding="0" cellspacing="0" border="0" style="margin:8px 0 18px 0;"><tr>`
    + `<td style="background:${MOSS};border-radius:6px;">`
    + `<a href="${escapeHtml(href)}" style="display:inline-block;padding:12px 20px;font-family:${SANS};font-size:15px;font-weight:bold;color:#ffffff;text-decoration:none;">${escapeHtml(label)}</a>`
    + `</td></tr></table>`
}

/** A small print line (expiry, why you got this). */
export function mailSmallPrint(html: string): string {
  return `<p style="margin:0 0 10px 0;font-family:${SANS};font-size:13px;line-height:19px;color:${MUTED};">${html}</p>`
}

/** A data table: a header row and body rows of already-escaped HTML cells. */
export function mailTable(headers: string[], rows: string[][]): string {
  const th = headers.map(h => `<th align="left" style="padding:6px 8px;border-bottom:2px solid #d8ccb2;font-family:${SANS};font-size:13px;color:${MUTED};font-weight:bold;">${escapeHtml(h)}</th>`).join('')
  const body = rows.map(cells => `<tr>${cells.map(c => `<td valign="top" style="padding:6px 8px;border-bottom:1px solid #e9e0cc;font-family:${SANS};font-size:14px;line-height:20px;color:${INK};">${c}</td>`).join('')}</tr>`).join('')
  return `<table role="presentation" width="100%" cellpadding="0" cellspacing="0" border="0" style="border-collapse:collapse;margin:0 0 12px 0;"><thead><tr>${th}</tr></thead><tbody>${body}</tbody></table>`
}

/** The whole HTML document of a message: a title, the body, and a footer of small print. */
export function mailLayout(options: { title: string, preheader?: string, bodyHtml: string, footerHtml?: string }): string {
  const preheader = options.preheader
    ? `<div style="display:none;max-height:0;overflow:hidden;mso-hide:all;">${escapeHtml(options.preheader)}</div>`
    : ''
  return `<!DOCTYPE html>
<html lang="en-GB"><head><meta charset="utf-8"><meta name="viewport" content="width=device-width, initial-scale=1"><meta name="color-scheme" content="light"><title>${escapeHtml(options.title)}</title></head>
<body style="margin:0;padding:0;background:${PAPER};">${preheader}
<table role="presentation" width="100%" cellpadding="0" cellspacing="0" border="0" style="background:${PAPER};"><tr><td align="center" style="padding:24px 12px;">
<table role="presentation" width="100%" cellpadding="0" cellspacing="0" border="0" style="max-width:640px;background:#ffffff;border:1px solid #e9e0cc;border-radius:10px;">
<tr><td style="padding:18px 24px;border-bottom:4px solid ${MOSS};"><span style="font-family:${FONT};font-size:22px;color:${MOSS};">Bloomline</span></td></tr>
<tr><td style="padding:20px 24px 8px 24px;">
<h1 style="margin:0 0 14px 0;font-family:${FONT};font-size:24px;line-height:30px;font-weight:normal;color:${INK};">${escapeHtml(options.title)}</h1>
${options.bodyHtml}
</td></tr>
<tr><td style="padding:14px 24px 20px 24px;border-top:1px solid #e9e0cc;">${options.footerHtml ?? ''}${mailSmallPrint('Sent by Bloomline, which keeps coat work, readiness and show plans for kennels and breed clubs.')}</td></tr>
</table></td></tr></table></body></html>`
}
