import { loadCvNode } from '../src/cli/cvNode.js';

loadCvNode();
