// Status lines and problem lists shared by the page's sections.

export function showStatus(element, text, busy = false) {
  element.textContent = text;
  element.classList.toggle('busy', busy);
}

/** Shows a service problem: its title in the status line, each bad field in the list and on its control. */
export function showProblem(statusElement, listElement, error, setup) {
  showStatus(statusElement, error?.message ?? String(error));
  const fieldErrors = Array.isArray(error?.fieldErrors) ? error.fieldErrors : [];
  setup?.markProblems(fieldErrors);
  listElement.replaceChildren(
    ...fieldErrors.map(({ field, message }) => {
      const li = document.createElement('li');
      li.textContent = field ? `${field}: ${message}` : message;
      return li;
    }),
  );
  listElement.hidden = fieldErrors.length === 0;
}

/**
 * Runs `task` for a section (its `status` line, `problems` list and the `setup` form) with the
 * problems of an earlier run cleared; when it fails, `clear()` withdraws what it left and the
 * problem is shown.
 */
export async function runShowingProblems(section, task, clear) {
  section.problems.hidden = true;
  section.setup.markProblems([]);
  try {
    await task();
  } catch (error) {
    clear();
    showProblem(section.status, section.problems, error, section.setup);
  }
}
