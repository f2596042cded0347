/** The HTML page where a developer picks whom to sign in as. Plain markup, no script. */
import type { DemoIdentity } from './demo-identities';

/** Escapes text for HTML element content and quoted attribute values. */
export function escapeHtml(text: string): string {
  return text.replace(/[&<>"']/g, (c) => ({ '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;', "'": '&#39;' })[c] as string);
}

/** The identity picker; `params` are the authorization request parameters, carried through as hidden fields. */
export function pickerPage(identities: readonly DemoIdentity[], params: Readonly<Record<string, string>>, clientName: string): string {
  const hidden = Object.entries(params)
    .map(([k, v]) => `<input type="hidden" name="${escapeHtml(k)}" value="${escapeHtml(v)}">`)
    .join('');
  const choices = identities
    .map((d) => `<li><button type="submit" name="identity" value="${escapeHtml(d.login)}" data-login="${escapeHtml(d.login)}">`
      + `<strong>${escapeHtml(d.name)}</strong> <span class="login">@${escapeHtml(d.login)}</span>`
      + `<span class="blurb">${escapeHtml(d.blurb)}</span></button></li>`)
    .join('');
  return `<!doctype html>
<html lang="en"><head><meta charset="utf-8"><meta name="viewport" content="width=device-width, initial-scale=1">
<title>Local sign-in for ${escapeHtml(clientName)}</title>
<style>
  body { font: 16px/1.45 system-ui, sans-serif; margin: 0; background: #eef1ec; color: #1c2420; }
  main { max-width: 34rem; margin: 3rem auto; padding: 1.5rem 2rem; background: #fff; border-radius: 12px; border: 1px solid #c9d2c6; }
  h1 { font-size: 1.3rem; margin: 0 0 .4rem; }
  p.note { margin: 0 0 1.2rem; color: #4a5750; font-size: .92rem; }
  ul { list-style: none; padding: 0; margin: 0; display: grid; gap: .6rem; }
  button { width: 100%; text-align: left; padding: .7rem .9rem; border: 1px solid #9fb09a; border-radius: 8px; background: #f7f9f5; cursor: pointer; font: inherit; }
  button:hover, button:focus-visible { background: #e1eadb; outline: 2px solid #40683a; }
  .login { color: #4a5750; font-size: .9rem; }
  .blurb { display: block; font-size: .85rem; color: #4a5750; }
  .cancel { margin-top: 1rem; background: none; border: none; text-decoration: underline; width: auto; padding: 0; }
</style></head>
<body><main>
<h1>Local sign-in for ${escapeHtml(clientName)}</h1>
<p class="note">This stand-in provider runs only on this machine, for development and tests. Pick an invented demo person.</p>
<form method="get" action="authorize">${hidden}<ul>${choices}</ul>
<button class="cancel" type="submit" name="deny" value="1">Cancel sign-in</button></form>
</main></body></html>`;
}
