import { inject, onBeforeUnmount, reactive, shallowRef, triggerRef, watch, type InjectionKey } from 'vue';
import type { EditOp } from '@shared/protocol/messages';

/**
 * Every form field that edits the sketch document is a small local edit session [F1]–[F5]
 * (DEVELOPERS.md, "Field edit sessions"). A session opens when the field takes focus and
 * remembers the value it was opened on (`base`); what the person types is the `draft`.
 *
 * - [F1] A field sends only a change its person made: nothing when the draft equals the value
 *   it was opened on, however the document changed meanwhile.
 * - [F2] While the person has not typed, the field follows the document (a colleague's change
 *   shows at once, with who made it).
 * - [F3] A change by someone else to a field being typed in never replaces the typing: the
 *   field keeps it and shows a conflict (who changed it, to what) until the person keeps theirs
 *   or takes the other value. Leaving the field does not decide for them.
 * - [F4] A refused value stays in the field with the reason until corrected or cancelled.
 * - [F5] Fields that belong to a vertex follow it when rows shift (a vertex inserted or deleted
 *   above); a vertex deleted under the typing is a conflict that can only be discarded.
 *
 * The same composable serves the vertex table, the condition panel, the loads form and the
 * title: each gives `read` (the document's value, as displayed) and `send` (the op for a value).
 */

/** A document change as open fields hear about it (SketchView provides the feed). */
export interface FieldChangeEvent {
  /** The edit as it changed the document shown; null when unknown (a reload or snapshot). */
  op: EditOp | null;
  /** Display name of who made it; null for the person's own edits in this window. */
  by: string | null;
}
export type FieldChangeFeed = (listener: (event: FieldChangeEvent) => void) => () => void;
export const FIELD_CHANGES: InjectionKey<FieldChangeFeed> = Symbol('fieldChanges');

/** Name used when a change cannot be attributed (e.g. the sketch was reloaded under a field). */
export const UNKNOWN_AUTHOR = 'Someone';

export interface FieldEditSpec<T> {
  /** The field's value in the document, as displayed; undefined when what it edits is gone. */
  read(key: string): T | undefined;
  /** Sends the person's value as one op; returns null when it went out, else the reason it did not. */
  send(key: string, value: T): string | null;
  equal?(a: T, b: T): boolean;
  /** Whether an edit can change this field (for saying who changed it). Default: any edit. */
  touches?(key: string, op: EditOp): boolean;
  /** The field's key after an edit (vertex rows shift); null when its vertex is gone. Default: the same key. */
  remap?(key: string, op: EditOp): string | null;
  /** A session moved to another key (e.g. the focused row shifted): move the focus with it. */
  onMoved?(from: string, to: string): void;
}

export interface FieldConflict<T> {
  /** The document's value now; undefined when what the field edits was deleted. */
  theirs: T | undefined;
  by: string;
}

export interface FieldSession<T> {
  key: string;
  /** The value the field was opened on (follows the document while untouched [F2]). */
  base: T | undefined;
  draft: T | undefined;
  /** The person typed since the field opened. */
  touched: boolean;
  focused: boolean;
  conflict: FieldConflict<T> | null;
  /** Someone changed the field while it was open and untouched (it shows their value). */
  changedBy: string | null;
  /** Why the last value was refused [F4]. */
  error: string | null;
  /** The thing it edits was deleted (the session is kept only so the typing can be seen and discarded). */
  gone: boolean;
  /** Who last changed this field while it was open: a name, null for the person's own edit elsewhere (e.g. undo), undefined when no change was heard. */
  lastBy: string | null | undefined;
}

export type CommitResult = 'sent' | 'unchanged' | 'conflict' | 'refused';

export function useFieldEdits<T>(spec: FieldEditSpec<T>) {
  const equal = spec.equal ?? ((a: T, b: T) => Object.is(a, b));
  const same = (a: T | undefined, b: T | undefined) => (a === undefined || b === undefined ? a === b : equal(a, b));
  const sessions = shallowRef(new Map<string, FieldSession<T>>());
  const touch = () => triggerRef(sessions);

  function get(key: string): FieldSession<T> | undefined {
    return sessions.value.get(key);
  }

  function drop(key: string) {
    if (sessions.value.delete(key)) touch();
  }

  /** The field took focus: open a session on the document's value (or resume a kept one). */
  function focus(key: string) {
    const s = get(key);
    if (s) {
      s.focused = true;
      touch();
      return;
    }
    const base = spec.read(key);
    // Reactive, so components given a session re-render when it changes.
    sessions.value.set(key, reactive({ key, base, draft: base, touched: false, focused: true, conflict: null, changedBy: null, error: null, gone: false, lastBy: undefined }) as FieldSession<T>);
    touch();
  }

  /** The person typed or picked a value. */
  function input(key: string, value: T) {
    let s = get(key);
    if (!s) {
      focus(key);
      s = get(key)!;
    }
    // Inputs re-emit their value on blur or re-render: that is not typing.
    if (same(value, s.touched ? s.draft : s.base)) return;
    s.draft = value;
    s.touched = true;
    s.changedBy = null;
    if (s.error) s.error = null;
    touch();
  }

  /** What the field shows: the typing when there is any, else the document's value. */
  function shown(key: string): T | undefined {
    const s = get(key);
    return s && s.touched ? s.draft : spec.read(key);
  }

  function dirty(s: FieldSession<T>): boolean {
    return s.touched && !same(s.draft, s.base);
  }

  /**
   * Enter, blur or a step: send the person's change if there is one [F1]. With a conflict open
   * nothing is sent [F3]; a refused value stays with its reason [F4]. `stayOpen`: the field
   * keeps focus (Enter), so the session restarts on the value just sent.
   */
  function commit(key: string, options: { stayOpen?: boolean } = {}): CommitResult {
    const s = get(key);
    if (!s) return 'unchanged';
    if (!options.stayOpen) s.focused = false;
    if (s.conflict || s.gone) {
      touch();
      return 'conflict';
    }
    if (!dirty(s)) {
      restart(s, options.stayOpen);
      return 'unchanged';
    }
    const refused = spec.send(key, s.draft as T);
    if (refused) {
      s.error = refused;
      touch();
      return 'refused';
    }
    restart(s, options.stayOpen, true);
    return 'sent';
  }

  /**
   * `sent`: the person's own value just went in. `read` may still give the value from before it
   * (a component reads its document prop, which follows at the parent's next render), so the
   * change that arrives after the restart is theirs: it must not be credited to anyone [F2].
   */
  function restart(s: FieldSession<T>, stayOpen: boolean | undefined, sent = false) {
    if (stayOpen) {
      const base = spec.read(s.key);
      Object.assign(s, { base, draft: base, touched: false, conflict: null, changedBy: null, error: null, lastBy: sent ? null : undefined });
      touch();
    } else drop(s.key);
  }

  /** Escape: forget the typing; the field shows the document's value again. */
  function cancel(key: string) {
    drop(key);
  }

  /** Conflict: send the person's own value over the other change. */
  function keepMine(key: string): CommitResult {
    const s = get(key);
    if (!s || s.gone) return 'unchanged';
    s.conflict = null;
    s.base = spec.read(key);
    s.touched = true;
    return commit(key, { stayOpen: s.focused });
  }

  /** Conflict: drop the typing and take the document's value. */
  function takeTheirs(key: string) {
    const s = get(key);
    if (!s) return;
    if (s.focused && !s.gone) restart(s, true);
    else drop(key);
  }

  /** Open sessions that need the person's attention (conflicts, refusals), for a table's footer. */
  function attention(): FieldSession<T>[] {
    return [...sessions.value.values()].filter((s) => s.conflict || s.error || s.gone || (s.changedBy && s.focused));
  }

  // Attribution and row shifts: hear every document change while sessions are open [F5].
  const feed = inject(FIELD_CHANGES, null);
  const stop = feed?.((event) => {
    if (sessions.value.size === 0) return;
    const by = event.by;
    const moved = new Map<string, FieldSession<T>>();
    let changed = false;
    for (const s of sessions.value.values()) {
      if (s.gone) {
        moved.set(s.key, s);
        continue;
      }
      if (!event.op || (spec.touches?.(s.key, event.op) ?? true)) s.lastBy = by;
      const next = event.op && spec.remap ? spec.remap(s.key, event.op) : s.key;
      if (next === null) {
        changed = true;
        if (s.touched) {
          const key = `${s.key}#gone`;
          moved.set(key, reactive({ ...s, key, gone: true, focused: false, error: null, conflict: { theirs: undefined, by: by ?? 'You' } }) as FieldSession<T>);
        }
        continue;
      }
      if (next !== s.key) {
        changed = true;
        const from = s.key;
        s.key = next;
        moved.set(next, s);
        if (s.focused) queueMicrotask(() => spec.onMoved?.(from, next));
        continue;
      }
      moved.set(s.key, s);
    }
    if (changed) sessions.value = moved;
  });
  if (stop) onBeforeUnmount(stop);

  // The document changed under open fields: follow it [F2] or raise a conflict [F3].
  watch(
    () => [...sessions.value.values()].filter((s) => !s.gone).map((s) => [s, spec.read(s.key)] as const),
    (entries) => {
      let changed = false;
      for (const [s, now] of entries) {
        if (sessions.value.get(s.key) !== s || same(now, s.base)) continue;
        const by = s.lastBy === undefined ? UNKNOWN_AUTHOR : (s.lastBy ?? 'You');
        changed = true;
        if (!s.touched) {
          s.base = now;
          s.draft = now;
          s.changedBy = s.lastBy === null ? null : by;
        } else if (same(now, s.draft)) {
          // Someone set what the person was typing: nothing left to decide or send.
          s.base = now;
          s.conflict = null;
          s.touched = false;
        } else if (now === undefined) {
          s.conflict = { theirs: undefined, by };
        } else {
          s.conflict = { theirs: now, by };
          s.base = now;
        }
      }
      if (changed) touch();
    },
  );

  return { sessions, get, focus, input, shown, commit, cancel, keepMine, takeTheirs, attention, isDirty: (key: string) => !!get(key) && dirty(get(key)!) };
}
