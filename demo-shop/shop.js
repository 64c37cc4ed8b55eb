// Harbor Lane's basket: fills from the estimator's `treadwise-add-to-basket` event and keeps the
// lines for this tab. The estimator never touches payment; the shop's own checkout would.
(() => {
  const STORAGE = 'harbor-lane-basket';
  /** @type {{ sku: string, quantity: number, unitPrice: number }[]} */
  let lines = [];
  let currency = 'EUR';
  try {
    const saved = JSON.parse(sessionStorage.getItem(STORAGE) ?? 'null');
    if (saved && Array.isArray(saved.lines)) ({ lines, currency } = saved);
  } catch {
    // A damaged saved basket starts empty.
  }

  const format = (amount) => new Intl.NumberFormat('en-IE', { style: 'currency', currency }).format(amount);

  function render() {
    const body = document.querySelector('[data-basket-lines]');
    const table = document.querySelector('[data-basket-table]');
    const empty = document.querySelector('[data-basket-empty]');
    const clear = document.querySelector('[data-basket-clear]');
    body.replaceChildren(
      ...lines.map((line) => {
        const row = document.createElement('tr');
        row.dataset.sku = line.sku;
        for (const text of [line.sku, String(line.quantity), format(line.quantity * line.unitPrice)]) {
          const cell = document.createElement('td');
          cell.textContent = text;
          row.append(cell);
        }
        return row;
      }),
    );
    const total = lines.reduce((sum, l) => sum + Math.round(l.quantity * l.unitPrice * 100), 0) / 100;
    document.querySelector('[data-basket-total]').textContent = format(total);
    document.querySelector('[data-basket-count]').textContent = String(lines.reduce((n, l) => n + l.quantity, 0));
    table.hidden = lines.length === 0;
    clear.hidden = lines.length === 0;
    empty.hidden = lines.length > 0;
  }

  function save() {
    sessionStorage.setItem(STORAGE, JSON.stringify({ lines, currency }));
    render();
  }

  document.addEventListener('treadwise-add-to-basket', (event) => {
    const detail = event.detail;
    if (!detail || !Array.isArray(detail.lines)) return;
    if (lines.length && detail.currency !== currency) lines = []; // one currency per basket
    currency = detail.currency;
    for (const line of detail.lines) {
      const same = lines.find((l) => l.sku === line.sku && l.unitPrice === line.unitPrice);
      if (same) same.quantity += line.quantity;
      else lines.push({ sku: line.sku, quantity: line.quantity, unitPrice: line.unitPrice });
    }
    save();
  });

  document.addEventListener('DOMContentLoaded', () => {
    document.querySelector('[data-basket-clear]').addEventListener('click', () => {
      lines = [];
      save();
    });
    render();
  });
})();
