import { FormMessage } from "@/components/ui";
import { describeError, isApiError } from "@/lib/api-error";

/**
 * The server enforces the overlap rule (one device on one body at a time; one device per placement
 * of a patient at a time) and answers 409 with the reason. Its message is shown word for word.
 */
export function AssignmentError({ error }: { error: unknown }) {
  if (!error) return null;
  const overlap = isApiError(error) && error.status === 409;
  return (
    <FormMessage tone="error">
      <span className="block">
        <span aria-hidden="true">⚠ </span>
        {overlap ? "Refused: this would overlap another assignment." : "The change was not saved."}
      </span>
      <span className="mt-1 block font-normal">{describeError(error)}</span>
      {overlap ? (
        <span className="mt-1 block font-normal">
          End the other assignment first, or choose a start time after it ends.
        </span>
      ) : null}
    </FormMessage>
  );
}
