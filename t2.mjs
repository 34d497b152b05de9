import * as fx from './dist/src/numeric/fixed.js';
const F=220;
console.log(fx.toFloat(fx.log(3n<<BigInt(F), F), F), Math.log(3));
console.log(fx.toFloat(fx.atan2(1n<<BigInt(F), 1n<<BigInt(F), F), F), Math.PI/4);
