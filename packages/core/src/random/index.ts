export {
  createRandomStream,
  restoreRandomStream,
  RandomStateError,
  type RandomStream,
  type RandomStreamState,
} from './randomStream.js';
export { chainSeedText, createChainStream, createRunStreams } from './runStreams.js';
