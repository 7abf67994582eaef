import { useCurrentUser } from "../../auth/api/auth";
import { PageHeader } from "../../../components/ui/layout";
import { ROLE_LABELS } from "../../../../shared/auth/roles";

export function HomePage() {
  const user = useCurrentUser();
  return <PageHeader title={`Good to see you, ${user.name.split(" ")[0]}`} subtitle={`Signed in as ${ROLE_LABELS[user.role]}.`} />;
}
