/**
 * Task pane placeholder: shows that the shared runtime is up and which model
 * version the worksheet functions compute with. The planner UI replaces this.
 */
import { MODEL_VERSION } from '../src/physics';
import { APP_VERSION } from '../src/functions/version';

function show(id: string, text: string): void {
  const el = document.getElementById(id);
  if (el) el.textContent = text;
}

show('version', `Hush ${APP_VERSION}, model ${MODEL_VERSION}`);

if (typeof Office !== 'undefined' && typeof Office.onReady === 'function') {
  Office.onReady((info) => {
    show('status', info.host ? `Ready in ${info.host}.` : 'Ready (outside Office).');
  });
} else {
  show('status', 'Office.js is not loaded: open this page from Excel to use the add-in.');
}
