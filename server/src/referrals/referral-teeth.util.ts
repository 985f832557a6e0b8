import { parseTooth, ToothNumberError, type Procedure, type ToothNotation } from '@ostium/shared';

export interface ParsedTooth {
  toothFdi: string;
  procedure: Procedure;
}

/**
 * Reads each tooth of a referral in `notation` into its stored FDI form (one case per tooth). Errors
 * name the request field (`teeth.N.tooth`): a number that is not a tooth in the notation, or a tooth
 * already listed (compared after conversion, so "19" and "#19" are the same tooth).
 */
export function parseReferralTeeth(
  teeth: readonly { tooth: string; procedure?: Procedure }[],
  notation: ToothNotation,
  fallback: Procedure,
): { teeth: ParsedTooth[]; errors: { field: string; message: string }[] } {
  const errors: { field: string; message: string }[] = [];
  const seen = new Map<string, number>();
  const out: ParsedTooth[] = [];
  teeth.forEach((t, i) => {
    const field = `teeth.${i}.tooth`;
    try {
      const { fdi } = parseTooth(t.tooth, notation);
      const first = seen.get(fdi);
      if (first !== undefined) {
        errors.push({ field, message: `tooth ${t.tooth.trim()} is listed twice (also teeth.${first}.tooth); each tooth is one case` });
        return;
      }
      seen.set(fdi, i);
      out.push({ toothFdi: fdi, procedure: t.procedure ?? fallback });
    } catch (e) {
      if (!(e instanceof ToothNumberError)) throw e;
      errors.push({ field, message: e.message });
    }
  });
  return { teeth: out, errors };
}
