import { createLocale, enUS } from 'naive-ui';

/**
 * naive-ui's English words, without its generic placeholders ("Please Input", "Please Select"):
 * an input says what it wants through its label and, where useful, its own placeholder.
 */
export const meanderLocale = createLocale(
  {
    Input: { placeholder: '' },
    Select: { placeholder: '' },
    Cascader: { placeholder: '' },
    DynamicTags: { add: 'Add' },
  },
  enUS,
);
