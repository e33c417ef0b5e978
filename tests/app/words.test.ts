/** Engine refusals in the app's words; keyboard shortcuts. */
import { describe, expect, it } from 'vitest';
import { inAppWords, withoutCliHints } from '../../src/app/state/words.js';
import { commandForKey, keyOf } from '../../src/app/state/commands.js';

describe("the app's words", () => {
  it('drops command-line hints from core messages', () => {
    expect(withoutCliHints('the image has no scale: give the pixel size (e.g. --pixel-size 4um), two points a known distance apart')).toBe('the image has no scale: give the pixel size, two points a known distance apart');
    expect(withoutCliHints('a scale bar of 222.0 px was found but its length is unknown; give the printed bar length (e.g. 500um)')).toBe('a scale bar of 222.0 px was found but its length is unknown; give the printed bar length (for example 500um)');
    expect(withoutCliHints('use --drop-outliers')).toBe('use drop outliers');
  });

  it('says what happened with the file name, in full sentences', () => {
    expect(inAppWords('NOT_AN_IMAGE', 'the file is a ZIP archive', 'x.zip')).toBe('x.zip: this file cannot be opened. The file is a ZIP archive.');
    expect(inAppWords('NO_SPECIMEN', 'nothing separates from the background')).toMatch(/^no fracture surface stands out.*Nothing separates from the background\. Check/);
  });
});

describe('keyboard commands', () => {
  it('Ctrl+Z undoes, letters choose tools, ? opens the list', () => {
    expect(keyOf({ key: 'z', ctrlKey: true })).toBe('Ctrl+Z');
    expect(commandForKey({ key: 'z', ctrlKey: true })?.name).toBe('undo');
    expect(commandForKey({ key: 'y', ctrlKey: true })?.name).toBe('redo');
    expect(commandForKey({ key: 'o' })?.name).toBe('tool-outline');
    expect(commandForKey({ key: '?' })?.name).toBe('help');
    expect(commandForKey({ key: 'q' })).toBeUndefined();
  });
});
