/**
 * Engine refusals in the app's own words: what happened, and what to do in the app (not which
 * command-line option to give). Core's messages are kept as the detail.
 */

/** Core's sentence without command-line hints such as "(e.g. --pixel-size 4um)". */
export function withoutCliHints(message: string): string {
  return message
    .replace(/\s*\((?:e\.g\.\s*)?[^()]*--[a-z][^()]*\)/g, '')
    .replace(/--([a-z][a-z-]*)/g, (_, name: string) => name.replace(/-/g, ' '))
    .replace(/\(e\.g\. (\d[^)]*)\)/g, '(for example $1)')
    .trim();
}

const sentence = (s: string): string => {
  const t = s.trim();
  const u = t.charAt(0).toUpperCase() + t.slice(1);
  return /[.!?]$/.test(u) ? u : `${u}.`;
};

/** The message for an engine error with its stable code, in the app's words. */
export function inAppWords(code: string, message: string, file?: string): string {
  const detail = sentence(withoutCliHints(message));
  const name = file ? `${file}: ` : '';
  switch (code) {
    case 'EMPTY_INPUT':
    case 'NOT_AN_IMAGE':
    case 'UNSUPPORTED_IMAGE':
    case 'CORRUPT_IMAGE':
    case 'TRUNCATED_IMAGE':
    case 'ZERO_SIZE_IMAGE':
    case 'IMAGE_TOO_LARGE':
      return `${name}this file cannot be opened. ${detail}`;
    case 'NO_SPECIMEN':
      return `${name}no fracture surface stands out from the background, so nothing was measured. ${detail} Check that the whole specimen is in the frame against a plain background.`;
    case 'BAD_SCALE':
      return `${name}the scale cannot be set. ${detail}`;
    case 'BAD_MATERIAL':
      return `${name}the material sheet cannot be used. ${detail}`;
    case 'BAD_BOUNDARY':
      return `${name}the corrected outline or boundary cannot be measured. ${detail}`;
    case 'BAD_PARAMETER':
      return `${name}${detail}`;
    default:
      return `${name}the engine failed. ${detail}`;
  }
}
