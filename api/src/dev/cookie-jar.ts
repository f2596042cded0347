/** A minimal cookie jar for scripted HTTP clients on one host (tests, smoke checks). */

/** Cookies by name, updated from Set-Cookie headers. */
export class CookieJar {
  private readonly cookies = new Map<string, string>();

  /** Stores the cookies of a response; an expired or emptied cookie is removed. */
  store(response: Response): void {
    for (const line of response.headers.getSetCookie()) {
      const [pair, ...attrs] = line.split(';');
      const eq = pair.indexOf('=');
      if (eq < 0) continue;
      const name = pair.slice(0, eq).trim();
      const value = pair.slice(eq + 1).trim();
      const isExpired = attrs.some((a) => {
        const [k, v] = a.trim().split('=');
        if (k.toLowerCase() === 'max-age') return Number(v) <= 0;
        if (k.toLowerCase() === 'expires') return Date.parse(v) <= Date.now();
        return false;
      });
      if (isExpired || value === '') this.cookies.delete(name);
      else this.cookies.set(name, value);
    }
  }

  /** The raw value of cookie `name`. */
  get(name: string): string | undefined {
    return this.cookies.get(name);
  }

  /** The Cookie request header for every stored cookie. */
  header(): string {
    return [...this.cookies].map(([k, v]) => `${k}=${v}`).join('; ');
  }
}
