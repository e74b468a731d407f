// Beadroll's standing caution: its computed results support people's judgment and never replace it.
export const SAFETY_TEXT =
  "Beadroll's computed results support, and do not replace, the code edition in force, the company's quality manual and the responsible inspector.";

export function SafetyNotice({ className = '' }: { className?: string }) {
  return <p className={`text-xs text-stone-500 ${className}`}>{SAFETY_TEXT}</p>;
}
