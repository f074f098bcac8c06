// Stored plans (GET /v1/plans): a page at a time, newest first, filtered by status; Open reopens a
// plan in the plan section. Older pages follow the service's cursor; Newer steps back through the
// cursors already used.

import { getJson } from './api.js';
import { byId } from './dom.js';
import { showProblem, showStatus } from './status.js';

const pageSize = 10;

function item(plan, onOpen) {
  const li = document.createElement('li');
  li.dataset.plan = plan.id;
  li.dataset.status = plan.status;
  const label = document.createElement('span');
  label.className = 'plan-label';
  label.textContent = plan.label;
  const facts = document.createElement('span');
  facts.className = 'muted plan-facts';
  const created = new Date(plan.createdAt);
  const when = Number.isNaN(created.getTime()) ? plan.createdAt : created.toLocaleString();
  facts.textContent = `${plan.status} · ${plan.progress.done} / ${plan.progress.total} cells · ${when} · ${plan.id.slice(0, 8)}`;
  const open = document.createElement('button');
  open.type = 'button';
  open.className = 'secondary small';
  open.textContent = 'Open';
  open.setAttribute('aria-label', `Open plan: ${plan.label}, ${plan.status}`);
  open.addEventListener('click', () => onOpen(plan.id));
  const text = document.createElement('div');
  text.append(label, facts);
  li.append(text, open);
  return li;
}

export class PlanList {
  /** `onOpen(id)` reopens a plan. */
  constructor(onOpen) {
    this.onOpen = onOpen;
    this.list = byId('planListItems');
    this.status = byId('planListStatusLine');
    this.problems = byId('planListProblems');
    this.filter = byId('planListStatus');
    this.older = byId('planListOlder');
    this.newer = byId('planListNewer');
    // Cursors of the pages shown so far: [undefined (the first page), page 2's, …].
    this.cursors = [undefined];
    this.next = null;
    // The plan shown in the plan section, marked in the list.
    this.current = null;
    this.filter.addEventListener('change', () => this.load());
    byId('planListRefresh').addEventListener('click', () => this.load());
    this.older.addEventListener('click', () => this.show(this.cursors.length, this.next));
    this.newer.addEventListener('click', () => this.show(this.cursors.length - 2));
  }

  /** Marks the plan shown in the plan section (and reads the first page again). */
  showing(id) {
    this.current = id;
    return this.load();
  }

  /** Reads the first page again (after a filter change, a refresh or a new plan). */
  load() {
    this.cursors = [undefined];
    return this.show(0);
  }

  /** Shows page `index` (0-based); a new page's cursor is `cursor`. */
  async show(index, cursor = this.cursors[index]) {
    const params = new URLSearchParams({ limit: String(pageSize) });
    if (cursor) params.set('cursor', cursor);
    if (this.filter.value) params.set('status', this.filter.value);
    this.problems.hidden = true;
    showStatus(this.status, 'Reading the stored plans…', true);
    try {
      const page = await getJson(`v1/plans?${params}`);
      this.cursors = [...this.cursors.slice(0, index), cursor];
      this.next = page.next;
      this.list.replaceChildren(...page.items.map((plan) => item(plan, this.onOpen)));
      for (const li of this.list.children) {
        if (li.dataset.plan === this.current) li.setAttribute('aria-current', 'true');
      }
      this.older.disabled = !page.next;
      this.newer.disabled = index === 0;
      byId('planListPage').textContent = `page ${index + 1}`;
      const filter = this.filter.value ? ` ${this.filter.value}` : '';
      showStatus(
        this.status,
        page.items.length === 0 && index === 0
          ? `No${filter} plans stored.`
          : `${page.items.length}${filter} plan(s) on this page, newest first.`,
      );
    } catch (error) {
      showProblem(this.status, this.problems, error);
    }
  }
}
