import { describe, expect, it } from 'vitest';
import { REVISION_STATE_NAMES, revisionName } from './revision-name';

describe('revisionName', () => {
  it('names a revision by its vehicle and session, and says which stands', () => {
    expect(revisionName({ vehicleName: 'TC-14', sessionTitle: 'Yard flex test', revision: 2 })).toBe('TC-14 · Yard flex test · revision 2');
    expect(REVISION_STATE_NAMES.signed).toBe('current');
  });
});
