export {
  selectBackend,
  resetNativeProbe,
  DEFAULT_BACKEND,
  type BackendChoice,
  type BackendInfo,
  type BackendOptions,
} from './backend.js';
export { BackendSelectionError } from './errors.js';
export { loadTensorFlow, requireTensorFlow, type TensorFlow } from './loadTensorFlow.js';
