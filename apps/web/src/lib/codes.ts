// The codes Beadroll knows, by the names the trade writes them: the rules package's one list.
export { codeNames } from '@beadroll/rules';
