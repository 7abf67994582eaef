import { useForm } from "react-hook-form";
import { zodResolver } from "@hookform/resolvers/zod";
import { CertificateReviewSchema, type Calibration, type CertificateReview } from "../../../../shared/calibrations/calibrations.schemas";
import { useReviewCalibration } from "../api/calibrations";
import { Button } from "../../../components/ui/button";
import { TextAreaField } from "../../../components/ui/field";
import { ErrorNote } from "../../../components/ui/layout";
import { errorMessage } from "../../../lib/api-client";

/** The recorded review of an outside lab's certificate; the tool counts as in calibration only once it is accepted. */
export function ReviewForm({ calibration }: { calibration: Calibration }) {
  const review = useReviewCalibration();
  const form = useForm<CertificateReview>({ resolver: zodResolver(CertificateReviewSchema), defaultValues: { accepted: true, findings: "" } });
  const submit = (accepted: boolean) =>
    form.handleSubmit((v) => review.mutate({ calibrationId: calibration.id, review: { ...v, accepted } }))();
  return (
    <form noValidate aria-label="Certificate review" className="flex flex-col gap-2 rounded-md border border-caution/50 bg-caution-light/40 p-3" onSubmit={(e) => e.preventDefault()}>
      <p className="text-sm font-semibold">
        Review the certificate{calibration.certificateNumber ? ` ${calibration.certificateNumber}` : ""} from {calibration.lab?.name ?? "the lab"}: results, uncertainty, traceability,
        accreditation scope. The tool returns to service when the review is accepted.
      </p>
      <TextAreaField label="Findings" error={form.formState.errors.findings?.message} {...form.register("findings")} />
      {review.isError && <ErrorNote>{errorMessage(review.error)}</ErrorNote>}
      <div className="flex flex-wrap gap-2">
        <Button onClick={() => submit(true)} disabled={review.isPending}>
          Accept certificate
        </Button>
        <Button variant="danger" onClick={() => submit(false)} disabled={review.isPending}>
          Do not accept
        </Button>
      </div>
    </form>
  );
}
