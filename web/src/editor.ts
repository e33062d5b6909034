/**
 * The scenario editor: renders the field groups, writes what the user types into the document,
 * and shows the service's issues beside the field whose path they name.
 */
import { clone, getAt, pretty, setAt, under } from './doc.js';
import { h } from './dom.js';
import { GROUPS, type Field, type Group } from './fields.js';
import type { Doc, Issue, Json } from './types.js';

interface FieldView {
  field: Field;
  group: Group;
  row: HTMLElement;
  inputs: (HTMLInputElement | HTMLSelectElement | HTMLTextAreaElement)[];
  issue: HTMLElement;
}

interface GroupView {
  group: Group;
  box: HTMLDetailsElement;
  toggle?: HTMLInputElement;
  body: HTMLElement;
  issue: HTMLElement;
  stash?: Json;
}

const partIndex = (rest: string): number | undefined => {
  const m = /^\[(\d)\]/.exec(rest);
  return m ? Number(m[1]) : undefined;
};

export class Editor {
  private doc: Doc = {};
  private fields: FieldView[] = [];
  private groups: GroupView[] = [];
  private docText!: HTMLTextAreaElement;
  private docIssue!: HTMLElement;

  constructor(private root: HTMLElement, private onChange: (doc: Doc) => void) {
    for (const g of GROUPS) this.renderGroup(g);
    this.renderDocument();
  }

  get current(): Doc {
    return clone(this.doc);
  }

  load(doc: Doc): void {
    this.doc = clone(doc);
    for (const g of this.groups) {
      g.stash = undefined;
      // Optional blocks the document uses are shown open; the others stay folded.
      if (g.group.block) g.box.open = getAt(this.doc, g.group.block.path) !== undefined;
    }
    this.refresh();
  }

  /** Set one value (from outside the form), show it, and report the change. */
  patch(path: readonly (string | number)[], value: Json | undefined): void {
    setAt(this.doc, path, value);
    this.refresh();
    this.onChange(this.current);
  }

  /** Place issues beside their fields; returns the ones no field or group claims. */
  showIssues(issues: Issue[]): Issue[] {
    this.clearIssues();
    const rest: Issue[] = [];
    for (const iss of issues) {
      const fv = this.fieldFor(iss.path);
      if (fv) {
        const claimed = fv.field.paths.find((p) => under(iss.path, p)) ?? '';
        const tail = iss.path.slice(claimed.length);
        const part = fv.field.kind === 'triple' ? partIndex(tail) : undefined;
        const where = part !== undefined ? (fv.field.parts?.[part] ?? '') : tail.replace(/^\./, '');
        this.addIssue(fv.issue, where ? `${where}: ${iss.message}` : iss.message, iss.path);
        const targets = part !== undefined ? [fv.inputs[part]] : fv.inputs;
        for (const t of targets) t?.setAttribute('aria-invalid', 'true');
        fv.row.classList.add('has-issue');
        continue;
      }
      const gv = this.groups.filter((g) => under(iss.path, g.group.path) && !g.box.hidden).sort((a, b) => b.group.path.length - a.group.path.length)[0];
      if (gv) {
        this.addIssue(gv.issue, `${iss.path.slice(gv.group.path.length).replace(/^\./, '') || gv.group.path}: ${iss.message}`, iss.path);
        gv.box.open = true;
        continue;
      }
      rest.push(iss);
    }
    if (rest.length) for (const iss of rest) this.addIssue(this.docIssue, `${iss.path}: ${iss.message}`, iss.path);
    return rest;
  }

  clearIssues(): void {
    for (const el of this.root.querySelectorAll('.issue')) el.replaceChildren();
    for (const el of this.root.querySelectorAll('[aria-invalid]')) el.removeAttribute('aria-invalid');
    for (const el of this.root.querySelectorAll('.has-issue')) el.classList.remove('has-issue');
  }

  /** The visible field that owns an issue path (the longest matching path wins). */
  private fieldFor(path: string): FieldView | undefined {
    let best: FieldView | undefined;
    let len = -1;
    for (const fv of this.fields) {
      if (fv.row.hidden || fv.group.show?.(this.doc) === false) continue;
      for (const p of fv.field.paths) if (under(path, p) && p.length > len) { best = fv; len = p.length; }
    }
    return best;
  }

  private addIssue(slot: HTMLElement, text: string, path: string): void {
    slot.append(h('span', { class: 'issue-text', 'data-path': path }, text));
  }

  private renderGroup(g: Group): void {
    const issue = h('p', { class: 'issue group-issue', 'aria-live': 'polite' });
    const body = h('div', { class: 'group-body' });
    const box = h('details', { class: 'group', id: `group-${g.id}`, open: !g.block || undefined }, h('summary', {}, g.title), body, issue);
    const gv: GroupView = { group: g, box, body, issue };
    if (g.block) {
      const toggle = h('input', { type: 'checkbox', id: `block-${g.id}` });
      toggle.addEventListener('change', () => this.toggleBlock(gv, toggle.checked));
      gv.toggle = toggle;
      body.append(h('label', { class: 'block-toggle', for: toggle.id }, toggle, ` ${g.block.label}`));
    }
    for (const f of g.fields) this.renderField(f, g, body);
    this.groups.push(gv);
    this.root.append(box);
  }

  private toggleBlock(gv: GroupView, on: boolean): void {
    const b = gv.group.block;
    if (!b) return;
    if (on) setAt(this.doc, b.path, gv.stash ?? b.defaults());
    else {
      gv.stash = getAt(this.doc, b.path);
      setAt(this.doc, b.path, undefined);
    }
    this.changed(true);
  }

  private renderField(f: Field, g: Group, parent: HTMLElement): void {
    const id = `f-${f.id}`;
    const issue = h('p', { class: 'issue', id: `${id}-issue`, 'aria-live': 'polite' });
    const help = f.help ? h('span', { class: 'help', id: `${id}-help` }, f.help) : null;
    const describedBy = [help ? `${id}-help` : '', `${id}-issue`].filter(Boolean).join(' ');
    let inputs: FieldView['inputs'];
    let control: HTMLElement;
    if (f.kind === 'select') {
      const sel = h('select', { id, 'aria-describedby': describedBy }, ...(f.options ?? []).map((o) => h('option', { value: o.value }, o.label)));
      sel.addEventListener('change', () => this.input(fv));
      inputs = [sel];
      control = sel;
    } else if (f.kind === 'check') {
      const box = h('input', { type: 'checkbox', id, 'aria-describedby': describedBy });
      box.addEventListener('change', () => this.input(fv));
      inputs = [box];
      control = h('label', { class: 'check', for: id }, box, ` ${f.label}`);
    } else if (f.kind === 'json') {
      const ta = h('textarea', { id, rows: 5, spellcheck: 'false', 'aria-describedby': describedBy, class: 'json' });
      ta.addEventListener('input', () => this.input(fv));
      inputs = [ta];
      control = ta;
    } else if (f.kind === 'triple') {
      inputs = (f.parts ?? ['x', 'y', 'z']).map((p, i) => {
        const inp = h('input', { type: 'text', id: i === 0 ? id : `${id}-${i}`, 'aria-label': `${f.label} ${p}`, placeholder: p, autocomplete: 'off', spellcheck: 'false', 'aria-describedby': describedBy });
        inp.addEventListener('input', () => this.input(fv));
        return inp;
      });
      control = h('div', { class: 'triple' }, ...inputs.map((inp, i) => h('span', { class: 'part' }, h('span', { class: 'axis-tag', 'aria-hidden': 'true' }, f.parts?.[i] ?? ''), inp)));
    } else {
      const inp = h('input', { type: 'text', id, placeholder: typeof f.example === 'string' ? f.example : undefined, autocomplete: 'off', spellcheck: 'false', inputmode: f.kind === 'int' ? 'numeric' : undefined, 'aria-describedby': describedBy });
      inp.addEventListener('input', () => this.input(fv));
      inputs = [inp];
      control = inp;
    }
    const label = f.kind === 'check' ? null : h('label', { for: id }, f.label);
    const row = h('div', { class: `field kind-${f.kind}`, 'data-field': f.id, 'data-path': f.paths[0] ?? '' }, label ?? '', control, help, issue);
    const fv: FieldView = { field: f, group: g, row, inputs, issue };
    this.fields.push(fv);
    parent.append(row);
  }

  private renderDocument(): void {
    this.docText = h('textarea', { id: 'f-document', rows: 12, spellcheck: 'false', class: 'json', 'aria-describedby': 'f-document-issue' });
    this.docIssue = h('p', { class: 'issue', id: 'f-document-issue', 'aria-live': 'polite' });
    const apply = h('button', { type: 'button', id: 'apply-document', class: 'small' }, 'Apply document');
    apply.addEventListener('click', () => {
      try {
        const d = JSON.parse(this.docText.value) as unknown;
        if (!d || typeof d !== 'object' || Array.isArray(d)) throw new Error('expected a JSON object');
        this.load(d as Doc);
        this.onChange(this.current);
      } catch (e) {
        this.clearIssues();
        this.addIssue(this.docIssue, `not a JSON document: ${(e as Error).message}`, '(document)');
      }
    });
    const box = h('details', { class: 'group', id: 'group-document' }, h('summary', {}, 'Whole document (JSON)'), h('div', { class: 'group-body' }, h('label', { for: 'f-document', class: 'sr-only' }, 'scenario document as JSON'), this.docText, apply), this.docIssue);
    this.root.append(box);
  }

  private input(fv: FieldView): void {
    const f = fv.field;
    let value: string | string[] | boolean;
    if (f.kind === 'check') value = (fv.inputs[0] as HTMLInputElement).checked;
    else if (f.kind === 'triple') value = fv.inputs.map((i) => i.value);
    else value = (fv.inputs[0] as HTMLInputElement).value;
    if (f.kind === 'json') {
      try {
        if ((value as string).trim()) JSON.parse(value as string);
      } catch (e) {
        fv.issue.replaceChildren(h('span', { class: 'issue-text', 'data-path': f.paths[0] ?? '' }, `not valid JSON yet: ${(e as Error).message}`));
        return;
      }
    }
    f.write(this.doc, value);
    this.changed(f.reshapes === true);
  }

  private changed(reshape: boolean): void {
    if (reshape) this.refresh();
    else this.refreshVisibility();
    this.onChange(this.current);
  }

  /** Put the document's values into every field (except the one being typed in). */
  private refresh(): void {
    const active = document.activeElement;
    for (const fv of this.fields) {
      const v = fv.field.read(this.doc);
      fv.inputs.forEach((inp, i) => {
        if (inp === active && fv.field.kind !== 'select' && fv.field.kind !== 'check') return;
        if (inp instanceof HTMLInputElement && inp.type === 'checkbox') inp.checked = v === true;
        else inp.value = Array.isArray(v) ? (v[i] ?? '') : String(v);
      });
    }
    for (const gv of this.groups) {
      if (gv.toggle && gv.group.block) gv.toggle.checked = getAt(this.doc, gv.group.block.path) !== undefined;
    }
    this.refreshVisibility();
  }

  private refreshVisibility(): void {
    for (const gv of this.groups) {
      gv.box.hidden = gv.group.show?.(this.doc) === false;
      const on = !gv.group.block || getAt(this.doc, gv.group.block.path) !== undefined;
      gv.body.classList.toggle('block-off', !on);
    }
    for (const fv of this.fields) {
      if (typeof fv.field.example === 'function') fv.inputs[0]?.setAttribute('placeholder', fv.field.example(this.doc));
      const blockOff = fv.group.block !== undefined && getAt(this.doc, fv.group.block.path) === undefined;
      fv.row.hidden = blockOff || fv.field.show?.(this.doc) === false;
    }
    if (document.activeElement !== this.docText) this.docText.value = pretty(this.doc);
  }
}
