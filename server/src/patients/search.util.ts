import { Op, type WhereOptions } from 'sequelize';

/** LIKE patterns (`%word%`) for each word of a search box, with the LIKE wildcards escaped. */
export function likeWords(q: string | undefined | null): string[] {
  if (!q) return [];
  return q
    .trim()
    .split(/[\s,]+/)
    .filter(Boolean)
    .slice(0, 6)
    .map((w) => `%${w.replace(/[\\%_]/g, (c) => `\\${c}`)}%`);
}

/** Every word of `q` in one of `fields` ("wren hall" finds Wren Halloway); undefined for an empty box. */
export function wordsWhere(q: string | undefined, fields: string[]): WhereOptions | undefined {
  const words = likeWords(q);
  if (!words.length) return undefined;
  return { [Op.and]: words.map((w) => ({ [Op.or]: fields.map((f) => ({ [f]: { [Op.like]: w } })) })) };
}

/** A directory search box: the words in the name fields, or the whole query in the e-mail, or its digits in the phone. */
export function contactSearchWhere(q: string | undefined, nameFields: string[]): WhereOptions | undefined {
  const names = wordsWhere(q, nameFields);
  if (!names) return undefined;
  const digits = q!.replace(/\D/g, '');
  return {
    [Op.or]: [
      names,
      { email: { [Op.like]: likeWords(q!.replace(/\s+/g, ''))[0] } },
      // Stored E.164 holds only digits after the +, so any typed punctuation is dropped first.
      ...(digits.length >= 4 ? [{ phone: { [Op.like]: `%${digits}%` } }] : []),
    ],
  };
}
