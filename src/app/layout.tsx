import { useState } from "react";
import { NavLink, Outlet, useNavigate } from "react-router-dom";
import { features } from "./features";
import type { NavItem } from "./nav-types";
import { useMe, useLogout } from "../features/auth/api/auth";
import { can, ROLE_LABELS, type Role } from "../../shared/auth/roles";
import { cx } from "../components/ui/cx";
import { useShopSettings } from "../features/tools/api/settings";
import { setShopTimeZone } from "../lib/format";

const GROUPS: { key: NavItem["group"]; label: string }[] = [
  { key: "work", label: "Bench" },
  { key: "register", label: "Register" },
  { key: "quality", label: "Quality" },
  { key: "admin", label: "Admin" },
];

/** Navigation entries the role may use, grouped and ordered. */
export function navFor(role: Role) {
  const items = features
    .flatMap((f) => f.nav)
    .filter((n) => (n.permission || n.roles ? (!!n.permission && can(role, n.permission)) || !!n.roles?.includes(role) : true))
    .sort((a, b) => a.order - b.order);
  return GROUPS.map((g) => ({ ...g, items: items.filter((i) => i.group === g.key) })).filter((g) => g.items.length);
}

export function AppLayout() {
  const me = useMe();
  const logout = useLogout();
  const navigate = useNavigate();
  const [open, setOpen] = useState(false);
  const settings = useShopSettings();
  // Every time on every page is shown in the shop's zone: set it before any page renders.
  setShopTimeZone(settings.data?.shopTimeZone);
  // Signed out a moment ago: render nothing while the router moves to sign-in.
  if (!me.data) return null;
  const user = me.data;
  const groups = navFor(user.role);

  return (
    <div className="min-h-screen lg:grid lg:grid-cols-[15rem_1fr]">
      <header className="no-print sticky top-0 z-20 flex items-center justify-between bg-ink px-4 py-3 text-paper lg:hidden">
        <Wordmark />
        <button type="button" className="rounded-md border border-paper/30 px-3 py-1.5 text-sm" aria-expanded={open} aria-controls="main-nav" onClick={() => setOpen((v) => !v)}>
          Menu
        </button>
      </header>
      <aside
        id="main-nav"
        className={cx("no-print bg-ink text-paper lg:sticky lg:top-0 lg:block lg:h-screen lg:overflow-y-auto", open ? "block" : "hidden")}
      >
        <div className="hidden px-5 pb-2 pt-5 lg:block">
          <Wordmark />
        </div>
        <nav aria-label="Main" className="px-3 py-2">
          {groups.map((g) => (
            <div key={g.key} className="mb-3">
              <p className="px-2 pb-1 text-xs font-semibold uppercase tracking-widest text-brass-bright">{g.label}</p>
              <ul>
                {g.items.map((item) => (
                  <li key={item.to}>
                    <NavLink
                      to={item.to}
                      end
                      onClick={() => setOpen(false)}
                      className={({ isActive }) => cx("block rounded-md px-2 py-1.5 text-sm", isActive ? "bg-paper/15 font-semibold text-white" : "text-paper/85 hover:bg-paper/10")}
                    >
                      {item.label}
                    </NavLink>
                  </li>
                ))}
              </ul>
            </div>
          ))}
        </nav>
        <div className="border-t border-paper/15 px-5 py-4 text-sm">
          <p className="font-semibold">{user.name}</p>
          <p className="text-paper/70">{ROLE_LABELS[user.role]}</p>
          <button
            type="button"
            className="mt-2 rounded-md border border-paper/30 px-3 py-1 text-sm hover:bg-paper/10"
            onClick={() => logout.mutate(undefined, { onSettled: () => navigate("/sign-in") })}
          >
            Sign out
          </button>
        </div>
      </aside>
      <main className="min-w-0 px-4 py-5 sm:px-6 lg:px-8">
        {/* A page drawn before the shop's zone is known would keep the browser's zone: the router does not draw it
            again when the settings come (a page whose data came first, such as a kept check sheet, showed its times
            hours off). Unreadable settings leave the browser's zone, named as such. */}
        {settings.isPending ? null : <Outlet />}
      </main>
    </div>
  );
}

export function Wordmark() {
  return (
    <span className="inline-flex items-baseline text-lg font-bold tracking-tight">
      Tenth<span className="text-brass-bright">wise</span>
    </span>
  );
}
