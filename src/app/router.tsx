import { createBrowserRouter, Navigate, Outlet, useLocation } from "react-router-dom";
import { features } from "./features";
import { AppLayout } from "./layout";
import { useMe } from "../features/auth/api/auth";
import { Loading, ErrorNote } from "../components/ui/layout";
import { errorMessage } from "../lib/api-client";

/** Pages below need a signed-in person; others go to sign-in and come back. */
function RequireSignIn() {
  const me = useMe();
  const location = useLocation();
  if (me.isPending) return <Loading what="Checking your sign-in" />;
  if (me.isError) return <ErrorNote>{errorMessage(me.error)}</ErrorNote>;
  if (!me.data) return <Navigate to={`/sign-in?next=${encodeURIComponent(location.pathname + location.search)}`} replace />;
  return <Outlet />;
}

function NotFound() {
  return (
    <div className="p-6">
      <h1 className="text-xl font-bold">Page not found</h1>
      <p className="text-ink-soft">That address is not a Tenthwise page.</p>
    </div>
  );
}

/** Shown while a page's code loads on a full page load (React Router renders it before the lazy route resolves). */
function PageLoading() {
  return <Loading what="Opening the page" />;
}

export const router = createBrowserRouter([
  { path: "/sign-in", HydrateFallback: PageLoading, lazy: async () => ({ Component: (await import("../features/auth/components/sign-in-page")).SignInPage }) },
  {
    element: <RequireSignIn />,
    HydrateFallback: PageLoading,
    children: [
      ...features.flatMap((f) => f.bareRoutes ?? []),
      {
        path: "/",
        element: <AppLayout />,
        children: [...features.flatMap((f) => f.routes), { path: "*", element: <NotFound /> }],
      },
    ],
  },
]);
