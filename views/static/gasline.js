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

  // Copy a text area (or the line) to the clipboard; fall back to selecting it when the clipboard is refused.
  function copyFrom(button) {
    var area = document.getElementById(button.getAttribute('data-copy'));
    if (!area) return;
    var label = button.getAttribute('data-label') || button.textContent;
    button.setAttribute('data-label', label);
    var what = button.getAttribute('data-what') || 'Note';
    var isField = area instanceof HTMLTextAreaElement;
    var text = isField ? area.value : area.textContent.trim();
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
      if (!isField) {
        const range = document.createRange();
        range.selectNodeContents(area);
        const selection = window.getSelection();
        selection.removeAllRanges();
        selection.addRange(range);
      } else {
        area.focus();
        area.select();
      }
      var ok = false;
      try {
        ok = document.execCommand('copy');
      } catch (_e) {
        ok = false;
      }
      done(ok);
    }
    if (navigator.clipboard && window.isSecureContext) {
      navigator.clipboard.writeText(text).then(() => {
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

  // Escape skips the open step (its Skip button), wherever the focus is in its form.
  document.addEventListener('keydown', (event) => {
    if (event.key !== 'Escape' || event.isComposing) return;
    var el = event.target;
    var form = el instanceof Element ? el.closest('.step-form') : null;
    var skip = form?.querySelector('button[value="skip"]');
    if (!(skip instanceof HTMLButtonElement)) return;
    event.preventDefault();
    form.requestSubmit(skip);
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

  // The clinician's own edits of the note and handover are never lost silently: before an answer is sent they
  // are taken aside, and if the new draft differs they stay in the box, with the new draft one press away.
  var edits = null;
  function editedBoxes() {
    var out = {};
    ['note-text', 'handover-text'].forEach((id) => {
      var box = document.getElementById(id);
      if (box && box.value !== box.defaultValue) out[id] = box.value;
    });
    return Object.keys(out).length ? out : null;
  }
  document.addEventListener('htmx:before:request', () => {
    edits = editedBoxes() || edits;
  });
  function offerBoth(kept) {
    var holder = document.getElementById('kept');
    if (!holder) return;
    var drafts = {};
    Object.keys(kept).forEach((id) => {
      var box = document.getElementById(id);
      if (!box || box.defaultValue === kept[id]) return;
      drafts[id] = box.defaultValue;
      box.value = kept[id];
    });
    var names = Object.keys(drafts).map((id) => (id === 'note-text' ? 'note' : 'handover'));
    if (!names.length) return;
    holder.hidden = false;
    holder.textContent = '';
    var p = document.createElement('p');
    p.textContent = `Your edits of the ${names.join(' and ')} are kept. Your answer changed the draft: keep your edits, or use the new draft.`;
    var keep = document.createElement('button');
    keep.type = 'button';
    keep.className = 'button button--primary';
    keep.textContent = 'Keep my edits';
    var use = document.createElement('button');
    use.type = 'button';
    use.className = 'button';
    use.textContent = 'Use the new draft';
    keep.addEventListener('click', () => {
      holder.hidden = true;
      announce('Your edits are kept.');
    });
    use.addEventListener('click', () => {
      Object.keys(drafts).forEach((id) => {
        document.getElementById(id).value = drafts[id];
      });
      edits = null;
      holder.hidden = true;
      announce('The new draft is in the box.');
    });
    var row = document.createElement('div');
    row.className = 'doubt-actions';
    row.append(keep, use);
    holder.append(p, row);
    announce(p.textContent);
  }

  // When the draft was written, in the clinician's own time; a later gas is taken now unless told otherwise.
  function localTime(date) {
    var pad = (n) => String(n).padStart(2, '0');
    return `${date.getFullYear()}-${pad(date.getMonth() + 1)}-${pad(date.getDate())} ${pad(date.getHours())}:${pad(date.getMinutes())}`;
  }
  function settle() {
    document.querySelectorAll('time.drafted').forEach((t) => {
      var when = new Date(t.getAttribute('datetime'));
      if (!Number.isNaN(when.getTime())) t.textContent = localTime(when);
    });
    document.querySelectorAll('input[data-now-if-empty]').forEach((input) => {
      if (input.value === '') input.value = localTime(new Date());
    });
    if (edits) offerBoth(edits);
    // the assistant's reply stays in sight above the question it leads to, while the question keeps the focus
    window.setTimeout(() => {
      var reply = document.getElementById('step-reply');
      var active = document.activeElement;
      if (!reply || !active?.closest('.entry--open')) return;
      reply.scrollIntoView({ block: 'start' });
      var bar = document.getElementById('draft-head');
      var room =
        window.innerHeight -
        (bar && getComputedStyle(bar).position === 'fixed' ? bar.offsetHeight : 0);
      if (active.getBoundingClientRect().bottom > room) active.scrollIntoView({ block: 'nearest' });
    }, 0);
  }
  document.addEventListener('htmx:after:settle', settle);
  if (document.readyState === 'loading') document.addEventListener('DOMContentLoaded', settle);
  else settle();

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
