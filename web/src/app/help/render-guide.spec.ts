import { renderGuide } from './render-guide';

describe('renderGuide', () => {
  it('renders headings, tables and code, and lists the ## sections in order', () => {
    const guide = renderGuide('## Roles\n\n| role | may |\n|---|---|\n| visitor | browse |\n\n## Files\n\n### Maps\n\n`type octile`\n');

    expect(guide.sections).toEqual([{ title: 'Roles' }, { title: 'Files' }]);
    expect(guide.html).toContain('<h2>Roles</h2>');
    expect(guide.html).toContain('<td>visitor</td>');
    expect(guide.html).toContain('<h3>Maps</h3>');
    expect(guide.html).toContain('<code>type octile</code>');
  });

  it('makes a code block a tab stop, so a keyboard can scroll a wide one, and escapes its text', () => {
    const guide = renderGuide('Run it:\n\n```bash\nnpm run solve -- --map a<b>.map\n```\n');

    expect(guide.html).toContain('<pre tabindex="0"><code class="language-bash">npm run solve -- --map a&lt;b&gt;.map\n</code></pre>');
  });

  it('points repository schema files and local app pages at this app', () => {
    const { html } = renderGuide('[plan](shared/plan-format.schema.json) and [boards](http://127.0.0.1:4300/leaderboards)');

    expect(html).toContain('<a href="/api/schemas/plan-format.schema.json">plan</a>');
    expect(html).toContain('<a href="/leaderboards">boards</a>');
  });

  it('shows links to repository files the app does not serve as plain text', () => {
    const { html } = renderGuide('See [DEVELOPERS.md](DEVELOPERS.md).');

    expect(html).toBe('<p>See DEVELOPERS.md.</p>\n');
  });

  it('shows raw HTML as text and drops script links and images', () => {
    const { html } = renderGuide('<script>alert(1)</script>\n\nHi <b onclick="x()">there</b> [x](javascript:alert(1)) ![pic](https://example.org/p.png)');

    expect(html).not.toMatch(/<script|<b |javascript:|<img/);
    expect(html).toContain('&lt;script&gt;');
    expect(html).toContain('pic');
  });
});
