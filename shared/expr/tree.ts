import type { ExpressionConstantName, ExpressionFunctionName } from './functions';

/**
 * The checked expression tree: built only from whitelisted constructs by checkExpression, and
 * the only input the generator and the evaluator accept. Never acorn's nodes.
 */
export type ArithmeticOperator = '+' | '-' | '*' | '/' | '**';
export type ComparisonOperator = '<' | '<=' | '>' | '>=' | '==' | '!=';
export type LogicalOperator = '&&' | '||';
export type UnaryOperator = '-' | '+' | '!';

export type ExprNode =
  | { readonly kind: 'number'; readonly value: number }
  | { readonly kind: 'constant'; readonly name: ExpressionConstantName }
  | { readonly kind: 'name'; readonly name: string }
  | { readonly kind: 'unary'; readonly op: UnaryOperator; readonly operand: ExprNode }
  | {
      readonly kind: 'arithmetic';
      readonly op: ArithmeticOperator;
      readonly left: ExprNode;
      readonly right: ExprNode;
    }
  | {
      readonly kind: 'comparison';
      readonly op: ComparisonOperator;
      readonly left: ExprNode;
      readonly right: ExprNode;
    }
  | {
      readonly kind: 'logical';
      readonly op: LogicalOperator;
      readonly left: ExprNode;
      readonly right: ExprNode;
    }
  | {
      readonly kind: 'conditional';
      readonly test: ExprNode;
      readonly then: ExprNode;
      readonly otherwise: ExprNode;
    }
  | { readonly kind: 'call'; readonly fn: ExpressionFunctionName; readonly args: readonly ExprNode[] };

/** A checked expression: its tree and the scope names it reads (sorted, no duplicates). */
export interface CheckedExpr {
  readonly root: ExprNode;
  readonly names: readonly string[];
}

/** A problem in an expression: character offsets [from, to) in its text and a plain message. */
export interface ExprError {
  from: number;
  to: number;
  message: string;
}

/** The scope names an expression reads, for dependency analysis. Constants are not included. */
export function usedNames(tree: CheckedExpr): ReadonlySet<string> {
  return new Set(tree.names);
}

export function collectNames(root: ExprNode): string[] {
  const names = new Set<string>();
  const visit = (node: ExprNode): void => {
    switch (node.kind) {
      case 'number':
      case 'constant':
        return;
      case 'name':
        names.add(node.name);
        return;
      case 'unary':
        visit(node.operand);
        return;
      case 'arithmetic':
      case 'comparison':
      case 'logical':
        visit(node.left);
        visit(node.right);
        return;
      case 'conditional':
        visit(node.test);
        visit(node.then);
        visit(node.otherwise);
        return;
      case 'call':
        node.args.forEach(visit);
        return;
    }
  };
  visit(root);
  return [...names].sort();
}
