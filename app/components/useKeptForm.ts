"use client";

import { useLayoutEffect, useRef, useState, type RefObject } from "react";
import { useLeaveGuard } from "./useLeaveGuard";

const LEAVE_WARNING = "This form has values that are not saved. Leave the page and lose them?";

type Field = HTMLInputElement | HTMLSelectElement | HTMLTextAreaElement;

/** The fields a person types or chooses in (named; hidden, file and submit inputs left out). */
function fieldsOf(form: HTMLFormElement): Field[] {
  return Array.from(form.elements).filter(
    (el): el is Field =>
      (el instanceof HTMLInputElement || el instanceof HTMLSelectElement || el instanceof HTMLTextAreaElement) &&
      el.name !== "" &&
      !["hidden", "file", "submit"].includes(el.type),
  );
}

const isCheckbox = (el: Field): el is HTMLInputElement => el instanceof HTMLInputElement && el.type === "checkbox";

/** The form's text, select and checkbox values by name. */
function valuesOf(form: HTMLFormElement): Record<string, string> {
  return Object.fromEntries(fieldsOf(form).map((el) => [el.name, isCheckbox(el) ? String(el.checked) : el.value]));
}

function setValues(form: HTMLFormElement, values: Record<string, string>): void {
  for (const el of fieldsOf(form)) {
    if (!(el.name in values)) continue;
    if (isCheckbox(el)) el.checked = values[el.name] === "true";
    else el.value = values[el.name];
  }
}

/**
 * Keep what was typed in an uncontrolled form until it is saved: while its values differ from those it was rendered
 * with, leaving the page (reload, close, an in-app link) asks first, and the values are kept in the tab's
 * sessionStorage under `key`, so Back and Forward, which cannot ask, lose nothing. On return they are put back and
 * `restored` is true (the form shows a notice). `generation` changes whenever the form is re-mounted with an answer
 * (its `key`); `refused` says that answer refused the save, so the values on the form are still unsaved. After a saved
 * answer the kept values are forgotten.
 */
export function useKeptForm(formRef: RefObject<HTMLFormElement | null>, key: string, generation: number, refused: boolean) {
  const [dirty, setDirty] = useState(false);
  const [restored, setRestored] = useState(false);
  const initial = useRef<Record<string, string> | null>(null);
  const storageKey = `cpet-desk:unsaved-form:${key}`;

  useLayoutEffect(() => {
    const form = formRef.current;
    if (!form) return;
    const rendered = valuesOf(form);
    // after a refused save the form shows values that were not saved: unsaved against anything, until a save succeeds
    initial.current = refused ? {} : rendered;
    if (refused) {
      setDirty(true);
      try {
        window.sessionStorage.setItem(storageKey, JSON.stringify(rendered));
      } catch {
        // storage disabled: the leave warning still protects the values
      }
    } else if (generation > 0) {
      // a saved answer: nothing is unsaved
      setDirty(false);
      setRestored(false);
      try {
        window.sessionStorage.removeItem(storageKey);
      } catch {
        // as above
      }
    }
    try {
      const raw = window.sessionStorage.getItem(storageKey);
      const kept = raw ? (JSON.parse(raw) as Record<string, string>) : null;
      const differs = kept && Object.entries(kept).some(([k, v]) => rendered[k] !== undefined && rendered[k] !== v);
      if (!refused && generation === 0 && differs) {
        setValues(form, kept!);
        // values kept outside React (sessionStorage), put back once after mount
        setRestored(true);
        setDirty(true);
      }
    } catch {
      // storage disabled or unreadable: the leave warning still protects the values
    }
    const onInput = () => {
      const now = valuesOf(form);
      const changed = refused || Object.entries(now).some(([k, v]) => initial.current![k] !== v);
      setDirty(changed);
      try {
        if (changed) window.sessionStorage.setItem(storageKey, JSON.stringify(now));
        else window.sessionStorage.removeItem(storageKey);
      } catch {
        // as above
      }
    };
    form.addEventListener("input", onInput);
    form.addEventListener("change", onInput);
    return () => {
      form.removeEventListener("input", onInput);
      form.removeEventListener("change", onInput);
    };
  }, [formRef, storageKey, generation, refused]);

  useLeaveGuard(dirty, LEAVE_WARNING);

  /** Drop the put-back values: the form shows what is saved again. */
  const discard = () => {
    try {
      window.sessionStorage.removeItem(storageKey);
    } catch {
      // as above
    }
    formRef.current?.reset();
    setDirty(false);
    setRestored(false);
  };
  return { dirty, restored, discard };
}
