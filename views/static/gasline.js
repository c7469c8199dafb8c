// Small enhancements on top of plain forms; the page works without this file.
// No state lives here: the case is in the forms, and htmx swaps the server's HTML.
(() => {
  var root = document.documentElement;
  root.classList.add('js');

  function announce(text) {
    var region = document.getElementById('announce');
    if (!region) return;
    // clear first so that the same words are read again
    region.textContent = '';
    window.setTimeout(() => {
      region.textContent = text;
    }, 50);
  }

  // Copy a text area to the clipboard; fall back to selecting it when the clipboard is refused.
  function copyFrom(button) {
    var area = document.getElementById(button.getAttribute('data-copy'));
    if (!area) return;
    var label = button.getAttribute('data-label') || button.textContent;
    button.setAttribute('data-label', label);
    var what = area.id === 'handover-text' ? 'Handover' : 'Note';
    function done(ok) {
      button.textContent = ok ? 'Copied' : 'Selected: press Ctrl+C';
      button.classList.toggle('is-copied', ok);
      announce(
        ok ? `${what} copied to the clipboard.` : `${what} selected: press Ctrl+C (Cmd+C) to copy.`,
      );
      window.setTimeout(() => {
        button.textContent = label;
        button.classList.remove('is-copied');
      }, 2500);
    }
    function fallback() {
      area.focus();
      area.select();
      var ok = false;
      try {
        ok = document.execCommand('copy');
      } catch (_e) {
        ok = false;
      }
      done(ok);
    }
    if (navigator.clipboard && window.isSecureContext) {
      navigator.clipboard.writeText(area.value).then(() => {
        done(true);
      }, fallback);
    } else {
      fallback();
    }
  }

  document.addEventListener('click', (event) => {
    var target = event.target instanceof Element ? event.target.closest('[data-copy]') : null;
    if (target) copyFrom(target);
  });

  // Enter moves on from a choice or a unit menu too, not only from a text field.
  document.addEventListener('keydown', (event) => {
    if (
      event.key !== 'Enter' ||
      event.shiftKey ||
      event.altKey ||
      event.ctrlKey ||
      event.metaKey ||
      event.isComposing
    )
      return;
    var el = event.target;
    if (!(el instanceof HTMLInputElement || el instanceof HTMLSelectElement)) return;
    var isChoice = el instanceof HTMLSelectElement || el.type === 'radio' || el.type === 'checkbox';
    if (!isChoice || !el.form?.classList.contains('step-form')) return;
    event.preventDefault();
    el.form.requestSubmit();
  });

  // Ctrl+Enter (Cmd+Enter) in the paste box reads the text; Enter alone is a new line there.
  document.addEventListener('keydown', (event) => {
    if (event.key !== 'Enter' || !(event.ctrlKey || event.metaKey) || event.isComposing) return;
    var el = event.target;
    if (
      !(el instanceof HTMLTextAreaElement) ||
      (el.id !== 'paste-text' && el.id !== 'paste-again') ||
      !el.form
    )
      return;
    event.preventDefault();
    var read = el.form.querySelector('button[value="read"]');
    el.form.requestSubmit(read instanceof HTMLButtonElement ? read : undefined);
  });

  // A unit shown beside a value (the pressure unit beside PaCO2 and PaO2) follows the unit chosen above it.
  document.addEventListener('change', (event) => {
    var el = event.target;
    if (!(el instanceof HTMLInputElement) || !el.form) return;
    el.form.querySelectorAll('[data-unit-for]').forEach((span) => {
      if (span.getAttribute('data-unit-for') === el.name) span.textContent = el.value;
    });
  });

  // Print what is in the text areas now, edits included.
  window.addEventListener('beforeprint', () => {
    document.querySelectorAll('[data-print-of]').forEach((pre) => {
      var area = document.getElementById(pre.getAttribute('data-print-of'));
      if (area) pre.textContent = area.value;
    });
  });

  // A request that never reached the server leaves the page as it was: say so.
  document.addEventListener('htmx:error', () => {
    announce('The server did not answer. Your answers are still on the page: try again.');
    var flow = document.getElementById('flow');
    if (flow && !document.getElementById('offline-note')) {
      const note = document.createElement('p');
      note.id = 'offline-note';
      note.className = 'problem-inline';
      note.setAttribute('role', 'alert');
      note.textContent =
        'The server did not answer. Your answers are still on the page: try again.';
      flow.prepend(note);
    }
  });
})();
