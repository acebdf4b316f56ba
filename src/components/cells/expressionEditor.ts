import { minimalSetup } from 'codemirror';
import { Compartment, EditorState, Prec } from '@codemirror/state';
import { EditorView, keymap, placeholder as placeholderText } from '@codemirror/view';
import { javascript } from '@codemirror/lang-javascript';
import { autocompletion, type CompletionContext, type CompletionResult } from '@codemirror/autocomplete';
import { forceLinting, linter } from '@codemirror/lint';
import { expressionCompletions, expressionDiagnostics } from './expressionDiagnostics';
import type { ScopeName } from './expressionCheck';

/**
 * The CodeMirror side of ExpressionField. It lives in its own module so the field can load it with
 * import(): CodeMirror becomes a separate chunk, fetched only when a model is on screen.
 */
export interface ExpressionEditorOptions {
  parent: HTMLElement;
  doc: string;
  label: string;
  placeholder?: string;
  readonly: boolean;
  /** An optional field (an exact solution) may be left blank. */
  allowEmpty: boolean;
  scope: () => readonly ScopeName[];
  onChange: (text: string) => void;
}

export interface ExpressionEditor {
  setText(text: string): void;
  setReadonly(readonly: boolean): void;
  /** Re-check after the names in scope changed (a parameter renamed elsewhere). */
  relint(): void;
  destroy(): void;
}

/** Diagnostics wait for a pause in typing, so the underline does not flicker on every key. */
const LINT_DELAY_MS = 300;

const meanderTheme = EditorView.theme({
  '&': {
    fontSize: '0.92em',
    border: '1px solid var(--meander-rule, #dcd2c0)',
    borderRadius: '4px',
    backgroundColor: 'var(--meander-paper, #fffcf6)',
  },
  '&.cm-focused': { outline: '2px solid var(--meander-accent, #1d6a64)', outlineOffset: '1px' },
  '.cm-content': { fontFamily: 'var(--meander-font-mono, "JetBrains Mono", monospace)', padding: '3px 0' },
  '.cm-line': { padding: '0 6px' },
  // CodeMirror's own grey is below 4.5:1 on paper.
  '.cm-placeholder': { color: 'var(--meander-ink-faint, #5a6366)' },
});

export function createExpressionEditor(options: ExpressionEditorOptions): ExpressionEditor {
  const editable = new Compartment();
  // Text set from outside (props) is not echoed back as a change the person made.
  let settingFromOutside = false;
  const editableExtensions = (readonly: boolean) => [
    EditorState.readOnly.of(readonly),
    EditorView.editable.of(!readonly),
  ];

  const completionSource = (context: CompletionContext): CompletionResult | null => {
    const word = context.matchBefore(/[\p{L}_][\p{L}0-9_]*/u);
    if (!word || (word.from === word.to && !context.explicit)) return null;
    return { from: word.from, options: expressionCompletions(options.scope()), validFor: /^[\p{L}0-9_]*$/u };
  };

  const view = new EditorView({
    parent: options.parent,
    state: EditorState.create({
      doc: options.doc,
      extensions: [
        minimalSetup,
        javascript(),
        EditorView.lineWrapping,
        // Expressions are one line: Enter does nothing unless the completion list is open.
        Prec.high(keymap.of([{ key: 'Enter', run: () => true }])),
        autocompletion({ override: [completionSource], activateOnTyping: true }),
        linter(
          (v) =>
            expressionDiagnostics(v.state.doc.toString(), options.scope(), {
              allowEmpty: options.allowEmpty,
            }),
          { delay: LINT_DELAY_MS },
        ),
        EditorView.contentAttributes.of({ 'aria-label': options.label }),
        placeholderText(options.placeholder ?? ''),
        editable.of(editableExtensions(options.readonly)),
        meanderTheme,
        EditorView.updateListener.of((update) => {
          if (update.docChanged && !settingFromOutside) options.onChange(update.state.doc.toString());
        }),
      ],
    }),
  });

  return {
    setText(text) {
      const current = view.state.doc.toString();
      if (text === current) return;
      settingFromOutside = true;
      try {
        view.dispatch({ changes: { from: 0, to: current.length, insert: text } });
      } finally {
        settingFromOutside = false;
      }
    },
    setReadonly(readonly) {
      view.dispatch({ effects: editable.reconfigure(editableExtensions(readonly)) });
    },
    relint() {
      forceLinting(view);
    },
    destroy() {
      view.destroy();
    },
  };
}
