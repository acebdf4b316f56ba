import { afterEach, describe, expect, it, vi } from 'vitest';
import { createExpressionEditor, type ExpressionEditor } from '@/components/cells/expressionEditor';
import type { ScopeName } from '@/components/cells/expressionCheck';

const scope: ScopeName[] = [
  { name: 'rate', kind: 'parameter' },
  { name: 'S', kind: 'state' },
  { name: 't', kind: 'time' },
];
let editor: ExpressionEditor | null = null;
afterEach(() => {
  editor?.destroy();
  editor = null;
  document.body.innerHTML = '';
});

function make(doc: string, onChange = vi.fn()) {
  const parent = document.createElement('div');
  document.body.append(parent);
  editor = createExpressionEditor({
    parent,
    doc,
    label: 'Drift of S',
    readonly: false,
    allowEmpty: false,
    scope: () => scope,
    onChange,
  });
  return { parent, onChange };
}

describe('the CodeMirror expression editor', () => {
  it('labels its content element for assistive technology and holds the text', () => {
    const { parent } = make('rate * S');
    const content = parent.querySelector('.cm-content')!;
    expect(content.getAttribute('aria-label')).toBe('Drift of S');
    expect(content.getAttribute('role')).toBe('textbox');
    expect(content.textContent).toBe('rate * S');
  });

  it('does not echo text set from outside back as a change', () => {
    const { parent, onChange } = make('rate * S');
    editor!.setText('-rate * S');
    expect(parent.querySelector('.cm-content')!.textContent).toBe('-rate * S');
    expect(onChange).not.toHaveBeenCalled();
  });

  it('becomes read-only on request', () => {
    const { parent } = make('S');
    editor!.setReadonly(true);
    expect(parent.querySelector('.cm-content')!.getAttribute('contenteditable')).toBe('false');
  });
});
