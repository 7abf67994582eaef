import { useForm } from "react-hook-form";
import { Navigate, useNavigate, useSearchParams } from "react-router-dom";
import type { LoginInput } from "../../../../shared/users/users.schemas";
import { useLogin, useMe } from "../api/auth";
import { TextField } from "../../../components/ui/field";
import { Button } from "../../../components/ui/button";
import { ErrorNote } from "../../../components/ui/layout";
import { errorMessage } from "../../../lib/api-client";

/** Something@somewhere.tld, as LoginSchema's e-mail check asks. */
const EMAIL = /^[^\s@]+@[^\s@]+\.[^\s@]+$/;

export function SignInPage() {
  const me = useMe();
  const login = useLogin();
  const navigate = useNavigate();
  const [sp] = useSearchParams();
  const next = sp.get("next") && sp.get("next")!.startsWith("/") ? sp.get("next")! : "/";
  // Checked here with the browser's own means (the first page a person loads stays small); the server
  // reads the same fields with LoginSchema and answers bad input with its messages.
  const form = useForm<LoginInput>({ defaultValues: { email: "", password: "" } });

  if (me.data) return <Navigate to={next} replace />;

  return (
    <div className="flex min-h-screen items-center justify-center bg-ink px-4">
      <div className="w-full max-w-sm rounded-card bg-paper-raised p-6 shadow-card">
        <p className="text-2xl font-bold tracking-tight">
          Tenth<span className="text-brass-dark">wise</span>
        </p>
        <p className="mb-5 text-sm text-ink-soft">Measuring tools you can trust, readings you can trace.</p>
        <form
          noValidate
          className="flex flex-col gap-4"
          onSubmit={form.handleSubmit((values) => login.mutate(values, { onSuccess: () => navigate(next, { replace: true }) }))}
        >
          <TextField label="E-mail" type="email" autoComplete="username" error={form.formState.errors.email?.message} {...form.register("email", { setValueAs: (v: string) => v.trim().toLowerCase(), validate: (v) => EMAIL.test(v) || "Enter an e-mail address." })} />
          <TextField label="Password" type="password" autoComplete="current-password" error={form.formState.errors.password?.message} {...form.register("password", { required: "Enter your password." })} />
          {login.isError && <ErrorNote>{errorMessage(login.error)}</ErrorNote>}
          <Button type="submit" disabled={login.isPending}>
            {login.isPending ? "Signing in…" : "Sign in"}
          </Button>
        </form>
      </div>
    </div>
  );
}
