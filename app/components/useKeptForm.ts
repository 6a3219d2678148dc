"use client";

import { useLayoutEffect, useRef, useState, type RefObject } from "react";
import { useLeaveGuard } from "./useLeaveGuard";

const LEAVE_WARNING = "This form has values that are not saved. Leave the page and lose them?";

/** The form's text, select and checkbox values by name (files and hidden fields left out). */
function valuesOf(form: HTMLFormElement): Record<string, string> {
  const out: Record<string, string> = {};
  for (const el of Array.from(form.elements)) {
    if (!(el instanceof HTMLInputElement || el instanceof HTMLSelectElement || el instanceof HTMLTextAreaElement)) continue;
    if (!el.name || el.type === "hidden" || el.type === "file" || el.type === "submit") continue;
    out[el.name] = el instanceof HTMLInputElement && el.type === "checkbox" ? String(el.checked) : el.value;
  }
  return out;
}

function setValues(form: HTMLFormElement, values: Record<string, string>): void {
  for (const el of Array.from(form.elements)) {
    if (!(el instanceof HTMLInputElement || el instanceof HTMLSelectElement || el instanceof HTMLTextAreaElement)) continue;
    if (!(el.name in values) || el.type === "hidden" || el.type === "file") continue;
    if (el instanceof HTMLInputElement && el.type === "checkbox") el.checked = values[el.name] === "true";
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
    initial.current = valuesOf(form);
    if (refused) {
      // the form shows the values of a refused save: unsaved until a save succeeds
      initial.current = {};
      setDirty(true);
      try {
        window.sessionStorage.setItem(storageKey, JSON.stringify(valuesOf(form)));
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
      const base = valuesOf(form);
      if (!refused && generation === 0 && kept && Object.entries(kept).some(([k, v]) => base[k] !== undefined && base[k] !== v)) {
        setValues(form, kept);
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
