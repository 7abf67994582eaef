/**
 * A five-field reminder schedule (minute hour day-of-month month weekday, as the settings accept) in a plain
 * sentence: "0 6 * * *" → "Every day at 06:00". Schedules it cannot put in words keep their fields, labelled.
 */
const DAYS = ["Sunday", "Monday", "Tuesday", "Wednesday", "Thursday", "Friday", "Saturday"];
const DAY_NAMES = ["sun", "mon", "tue", "wed", "thu", "fri", "sat"];
const MONTHS = ["January", "February", "March", "April", "May", "June", "July", "August", "September", "October", "November", "December"];

const isNum = (f: string) => /^\d{1,2}$/.test(f);
const numList = (f: string) => (/^\d{1,2}(,\d{1,2})*$/.test(f) ? f.split(",").map(Number) : null);
const two = (n: number) => String(n).padStart(2, "0");
const and = (xs: string[]) => (xs.length <= 1 ? xs.join("") : `${xs.slice(0, -1).join(", ")} and ${xs[xs.length - 1]}`);
const ordinal = (n: number) => `${n}${n % 10 === 1 && n !== 11 ? "st" : n % 10 === 2 && n !== 12 ? "nd" : n % 10 === 3 && n !== 13 ? "rd" : "th"}`;

function dayNumber(f: string): number | null {
  if (isNum(f)) return Number(f) % 7;
  const i = DAY_NAMES.indexOf(f.toLowerCase());
  return i >= 0 ? i : null;
}

function times(m: string, h: string): string | null {
  const hs = numList(h);
  const ms = numList(m);
  if (hs && ms && hs.every((x) => x < 24) && ms.every((x) => x < 60)) return `at ${and(hs.flatMap((hh) => ms.map((mm) => `${two(hh)}:${two(mm)}`)))}`;
  if (isNum(m) && Number(m) < 60 && h === "*") return `every hour at ${two(Number(m))} minutes past`;
  const everyH = /^\*\/(\d{1,2})$/.exec(h);
  if (isNum(m) && everyH) return `every ${everyH[1]} hours at ${two(Number(m))} minutes past`;
  const everyM = /^\*\/(\d{1,2})$/.exec(m);
  if (everyM && h === "*") return `every ${everyM[1]} minutes`;
  return null;
}

function days(dom: string, mon: string, dow: string): string | null {
  if (mon !== "*") {
    const ms = numList(mon);
    if (!ms || ms.some((x) => x < 1 || x > 12)) return null;
    const inner = days(dom, "*", dow);
    return inner && `${inner === "Every day" ? "Every day" : inner} in ${and(ms.map((x) => MONTHS[x - 1]))}`;
  }
  if (dom === "*" && (dow === "*" || dow === "?")) return "Every day";
  if (dom === "*") {
    const range = /^(\w+)-(\w+)$/.exec(dow);
    if (range) {
      const a = dayNumber(range[1]);
      const b = dayNumber(range[2]);
      return a === null || b === null ? null : `${DAYS[a]} to ${DAYS[b]}`;
    }
    const list = dow.split(",").map(dayNumber);
    return list.some((d) => d === null) ? null : `Every ${and(list.map((d) => DAYS[d!]))}`;
  }
  const doms = numList(dom);
  if (doms && dow === "*" && doms.every((x) => x >= 1 && x <= 31)) return `On the ${and(doms.map(ordinal))} of every month`;
  return null;
}

/** The schedule as a sentence, e.g. "Every day at 06:00" or "Monday to Friday at 06:00 and 14:00". */
export function describeCron(expr: string): string {
  const f = expr.trim().split(/\s+/);
  if (f.length === 5) {
    const [m, h, dom, mon, dow] = f;
    const t = times(m, h);
    const d = days(dom, mon, dow);
    if (t && d) return d === "Every day" && t.startsWith("every") ? t.charAt(0).toUpperCase() + t.slice(1) : `${d} ${t}`;
  }
  return `On a custom schedule (cron fields “${expr.trim()}”: minute, hour, day, month, weekday)`;
}
