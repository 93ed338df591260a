#include <cstdio>
int main() { std::puts("aquiledger: under construction"); return 0; }
