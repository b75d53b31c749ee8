"""input"""
