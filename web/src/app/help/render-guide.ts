/**
 * Turns the guide's Markdown into HTML for the Help page with marked. Strict on top of Angular's
 * sanitiser (which still cleans the result when it is bound with [innerHTML]): raw HTML in the
 * Markdown is shown as text, images are shown as their alt text, and links go through
 * `appHrefOf`, so repository paths become app URLs or plain text and no other scheme survives.
 * Code blocks are tab stops (tabindex 0): a block wider than the page scrolls sideways, and
 * without focus a keyboard could not scroll it (axe rule scrollable-region-focusable).
 */
import { Marked, type Tokens } from 'marked';
import { appHrefOf } from '@shared/help';

/** One top-level section of the guide (a `##` heading), for the page's contents list. */
export interface GuideSection {
  readonly title: string;
}

/** The guide as the page shows it. */
export interface RenderedGuide {
  readonly html: string;
  readonly sections: readonly GuideSection[];
}

/** Escapes text for HTML element content and double-quoted attribute values. */
function escapeHtml(text: string): string {
  return text.replace(/[&<>"']/g, (c) => ({ '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;', "'": '&#39;' })[c] as string);
}

const marked = new Marked({
  gfm: true,
  async: false,
  renderer: {
    html: ({ text }: Tokens.HTML | Tokens.Tag) => escapeHtml(text),
    image: ({ text }: Tokens.Image) => escapeHtml(text),
    code: ({ text, lang, escaped }: Tokens.Code) => {
      const language = lang?.match(/^\S+/)?.[0];
      const body = `${(escaped ? text : escapeHtml(text)).replace(/\n$/, '')}\n`;
      return `<pre tabindex="0"><code${language ? ` class="language-${escapeHtml(language)}"` : ''}>${body}</code></pre>\n`;
    },
    link(this: { parser: { parseInline(tokens: Tokens.Link['tokens']): string } }, { href, title, tokens }: Tokens.Link) {
      const inner = this.parser.parseInline(tokens);
      const target = appHrefOf(href);
      if (target === null) return inner;
      return `<a href="${escapeHtml(target)}"${title ? ` title="${escapeHtml(title)}"` : ''}>${inner}</a>`;
    },
  },
});

/** The HTML of `markdown` and its `##` sections in order. */
export function renderGuide(markdown: string): RenderedGuide {
  const tokens = marked.lexer(markdown);
  const sections = tokens
    .filter((t): t is Tokens.Heading => t.type === 'heading' && (t as Tokens.Heading).depth === 2)
    .map((t) => ({ title: t.text }));
  return { html: marked.parser(tokens), sections };
}
