/** The value of one cookie in a Cookie header (the first of that name, percent-decoded), or null. */
export function cookieValue(header: string | undefined, name: string): string | null {
  for (const part of String(header ?? "").split(";")) {
    const i = part.indexOf("=");
    if (i > 0 && part.slice(0, i).trim() === name) {
      let value = part.slice(i + 1).trim();
      if (value.startsWith('"') && value.endsWith('"') && value.length > 1) value = value.slice(1, -1);
      try {
        return value.includes("%") ? decodeURIComponent(value) : value;
      } catch {
        return null;
      }
    }
  }
  return null;
}
