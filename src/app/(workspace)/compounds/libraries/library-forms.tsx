"use client";
import { useActionState } from "react";
import { FieldError, FormMessage } from "@/components/forms/form-bits";
import { addToLibraryAction, createLibraryAction, removeFromLibraryAction } from "../actions";

export function CreateLibraryForm() {
  const [state, action, pending] = useActionState(createLibraryAction, null);
  return (
    <form action={action} className="card flex flex-col gap-2 p-3">
      <h2 className="text-sm font-semibold">New library</h2>
      <label className="text-xs text-ink-muted" htmlFor="lib-name">
        Name
        <input className="input mt-1" id="lib-name" name="name" required />
      </label>
      <FieldError state={state} name="name" />
      <label className="text-xs text-ink-muted" htmlFor="lib-description">
        Description
        <input className="input mt-1" id="lib-description" name="description" />
      </label>
      <label className="text-xs text-ink-muted" htmlFor="lib-ids">
        Registry IDs (optional; one per line, or separated by commas or spaces)
        <textarea
          className="input mt-1 h-28 font-mono"
          id="lib-ids"
          name="ids"
          placeholder={"INH-000001\nINH-000002"}
          spellCheck={false}
        />
      </label>
      <FormMessage state={state} />
      <div>
        <button className="btn-primary" disabled={pending}>
          {pending ? "Creating…" : "Create library"}
        </button>
      </div>
    </form>
  );
}

export function AddMembersForm({ libraryId }: { libraryId: string }) {
  const [state, action, pending] = useActionState(addToLibraryAction, null);
  return (
    <form action={action} className="flex flex-col gap-2">
      <input type="hidden" name="libraryId" value={libraryId} />
      <label className="text-xs text-ink-muted" htmlFor="add-ids">
        Add by registry ID (one, or a pasted list)
        <textarea
          className="input mt-1 h-20 font-mono"
          id="add-ids"
          name="ids"
          spellCheck={false}
          placeholder="INH-000042"
        />
      </label>
      <FormMessage state={state} />
      <div>
        <button className="btn-quiet" disabled={pending}>
          {pending ? "Adding…" : "Add to library"}
        </button>
      </div>
    </form>
  );
}

export function RemoveMemberButton({ libraryId, registryId }: { libraryId: string; registryId: string }) {
  const [state, action, pending] = useActionState(removeFromLibraryAction, null);
  return (
    <form action={action} className="inline">
      <input type="hidden" name="libraryId" value={libraryId} />
      <input type="hidden" name="registryId" value={registryId} />
      <button
        className="text-xs text-ink-muted hover:text-fail"
        disabled={pending}
        title={`Remove ${registryId} from this library`}
      >
        remove
      </button>
      {state && !state.ok ? <span className="ml-1 text-xs text-fail">{state.error}</span> : null}
    </form>
  );
}
