// Every corpus `npm run eval` reports, in the order it prints them.
import type { Corpus } from '../corpus.js';
import { cwruCorpus } from './cwru-load1.js';
import { femtoEndCorpus, femtoFirstHourCorpus } from './femto-learning.js';
import { imsCorpus } from './ims-healthy.js';
import { lumpedRigCorpus } from './lumped-rig.js';
import { rampCorpus, tunedCorpus } from './sim-tuned.js';
import { widenedCorpus } from './sim-widened.js';

export function allCorpora(): Corpus[] {
  return [
    cwruCorpus('de'),
    cwruCorpus('fe'),
    imsCorpus(),
    femtoFirstHourCorpus(),
    femtoEndCorpus(),
    widenedCorpus(),
    lumpedRigCorpus(),
    tunedCorpus(),
    rampCorpus('frequency'),
    rampCorpus('auto'),
  ];
}
